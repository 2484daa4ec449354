// The navigation each role sees. Later issues add their pages here.
import type { Role } from '#shared/types/auth'

export interface NavItem { to: string; label: string; icon: string }

const NAV: Record<Role, NavItem[]> = {
  lead: [
    { to: '/lead', label: 'Today', icon: 'sun' },
    { to: '/lead/board', label: 'Pour board', icon: 'board' },
    { to: '/day-sheet', label: 'Day sheet', icon: 'sheet' },
    { to: '/finishing', label: 'Finishing', icon: 'hammer' },
    { to: '/lead/jobs', label: 'Jobs', icon: 'clipboard' },
    { to: '/lead/clients', label: 'Clients', icon: 'building' },
    { to: '/lead/quotes', label: 'Quotes', icon: 'receipt' },
    { to: '/lead/moulds', label: 'Moulds', icon: 'shapes' },
    { to: '/lead/plasters', label: 'Plasters', icon: 'layers' },
    { to: '/lead/lots', label: 'Lots', icon: 'package' },
    { to: '/lead/benches', label: 'Benches', icon: 'bench' },
    { to: '/lead/quality', label: 'Quality', icon: 'chart' },
    { to: '/mix', label: 'Mix card', icon: 'calculator' },
    { to: '/lead/people', label: 'People', icon: 'users' },
    { to: '/lead/import', label: 'Import', icon: 'upload' },
    { to: '/lead/settings', label: 'Settings', icon: 'settings' },
    { to: '/lead/calendar', label: 'Shop calendar', icon: 'users' },
    { to: '/lead/mails', label: 'Captured mail', icon: 'mail' },
    { to: '/cautions', label: 'Cautions', icon: 'alert' },
  ],
  caster: [
    { to: '/floor', label: 'My pours', icon: 'flask' },
    { to: '/day-sheet', label: 'Day sheet', icon: 'sheet' },
    { to: '/mix', label: 'Mix card', icon: 'calculator' },
    { to: '/cautions', label: 'Cautions', icon: 'alert' },
  ],
  finisher: [
    { to: '/finishing', label: 'Finishing', icon: 'hammer' },
    { to: '/cautions', label: 'Cautions', icon: 'alert' },
  ],
  client: [
    { to: '/client', label: 'My jobs', icon: 'folder' },
  ],
}

export function useNavigation() {
  const { user } = useUserSession()
  return computed(() => (user.value ? NAV[user.value.role] : []))
}
