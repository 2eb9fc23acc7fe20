import { DEMO_USERS } from '../demo/demo-data'
import { ROLE_LABELS } from '../../shared/types/permissions'

/** `mailCatcherPort`: where the local mail catcher listens, or null when it does not run. */
export function printWelcome(
  url: string,
  mailCatcherPort: number | null = null,
  demoSeeded = true,
): void {
  const rows = DEMO_USERS.map(
    (user) => `  ${ROLE_LABELS[user.role].padEnd(14)} ${user.email.padEnd(36)} ${user.password}`,
  )
  console.log(
    [
      '',
      `Endplate is running at ${url}`,
      '',
      ...(demoSeeded ? ['Demo sign-ins (invented staff):', ...rows, ''] : []),
      ...(mailCatcherPort !== null
        ? [
            `Mail is caught locally on 127.0.0.1:${mailCatcherPort}; administrators read it on the Mail screen.`,
            '',
          ]
        : []),
      'Decision support only: verify landmarks and calibration; defer to local protocols.',
      'Press Ctrl-C to stop Endplate and its database.',
      '',
    ].join('\n'),
  )
}
