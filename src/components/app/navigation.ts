// The navigation entries per role, shared by the drawer and tests.
import {
  mdiAccountGroupOutline,
  mdiBookOpenPageVariantOutline,
  mdiClipboardTextOutline,
  mdiDatabaseArrowDownOutline,
  mdiEmailOutline,
  mdiHistory,
  mdiInformationOutline,
  mdiSineWave,
  mdiTableLarge,
  mdiAccountKeyOutline,
  mdiSchoolOutline,
} from '@mdi/js'
import type { Role } from '@shared/api'

export interface NavItem {
  title: string
  to: string
  icon: string
}

export function navFor(role: Role): NavItem[] {
  const about = { title: 'About and safety', to: '/about', icon: mdiInformationOutline }
  if (role === 'apprentice') {
    return [
      { title: 'My exercises', to: '/learn', icon: mdiClipboardTextOutline },
      { title: 'Free practice', to: '/learn/practice', icon: mdiSineWave },
      { title: 'My attempts', to: '/learn/attempts', icon: mdiHistory },
      about,
    ]
  }
  const teaching: NavItem[] = [
    { title: 'Cohorts', to: '/teach/cohorts', icon: mdiAccountGroupOutline },
    { title: 'Gradebook', to: '/teach/gradebook', icon: mdiTableLarge },
    { title: 'Scenario library', to: '/scenarios', icon: mdiBookOpenPageVariantOutline },
    { title: 'Free practice', to: '/learn/practice', icon: mdiSineWave },
  ]
  if (role === 'instructor') return [...teaching, about]
  return [
    { title: 'Users and roles', to: '/admin/users', icon: mdiAccountKeyOutline },
    { title: 'Mail outbox', to: '/admin/outbox', icon: mdiEmailOutline },
    { title: 'Backup', to: '/admin/backup', icon: mdiDatabaseArrowDownOutline },
    { title: 'Learning platforms', to: '/admin/learning-platforms', icon: mdiSchoolOutline },
    ...teaching,
    about,
  ]
}
