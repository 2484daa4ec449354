// GET /api/quality: the figures of shared/utils/quality.ts over the local days from..to.
import type { QualityFigures } from '#shared/utils/quality'

export interface QualityReportDto extends QualityFigures { from: string; to: string }
