import { DEMO_USERS } from '../demo/demo-data'
import { ROLE_LABELS } from '../../shared/types/permissions'

export function printWelcome(url: string): void {
  const rows = DEMO_USERS.map(
    (user) => `  ${ROLE_LABELS[user.role].padEnd(14)} ${user.email.padEnd(36)} ${user.password}`,
  )
  console.log(
    [
      '',
      `Endplate is running at ${url}`,
      '',
      'Demo sign-ins (invented staff):',
      ...rows,
      '',
      'Decision support only: verify landmarks and calibration; defer to local protocols.',
      'Press Ctrl-C to stop Endplate and its database.',
      '',
    ].join('\n'),
  )
}
