// The security headers of every answer (server/utils/security-headers.ts); pages get their own
// policy from server/plugins/security-headers.ts when they are rendered.
import { BASE_HEADERS } from '../utils/security-headers'

export default defineEventHandler((event) => {
  setResponseHeaders(event, BASE_HEADERS)
})
