/**
 * The command-line entry points end on one readable line instead of a stack trace when set-up
 * fails (a busy port, a failed package install): the message is what the user acts on.
 */
export function failClearly(): void {
  process.on('uncaughtException', (error) => {
    console.error(`\n${error instanceof Error ? error.message : String(error)}`)
    process.exit(1)
  })
}
