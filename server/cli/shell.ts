import { spawn, spawnSync, type SpawnOptions } from 'node:child_process'

/** Runs a command to completion with inherited output; throws when it exits non-zero. */
export function run(command: string, args: string[], options: SpawnOptions = {}): Promise<void> {
  return new Promise((resolvePromise, reject) => {
    const child = spawn(command, args, { stdio: 'inherit', ...options })
    child.on('error', reject)
    child.on('exit', (code, signal) => {
      if (code === 0) resolvePromise()
      else reject(new Error(`${command} ${args.join(' ')} exited with ${code ?? signal}`))
    })
  })
}

/** Runs a short command quietly and reports whether it succeeded. */
export function succeeds(command: string, args: string[]): boolean {
  const result = spawnSync(command, args, { stdio: 'ignore' })
  return result.status === 0
}

/** True when an executable is on PATH or at an absolute path. */
export function commandExists(command: string): boolean {
  return succeeds('sh', ['-c', `command -v ${command}`])
}

let aptUpdated = false

/** Installs Debian packages as root; the machine's only other registry is npm. */
export async function aptInstall(packages: string[]): Promise<void> {
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
  if (!aptUpdated) {
    await run('apt-get', ['update', '-q'], { env })
    aptUpdated = true
  }
  await run('apt-get', ['install', '-y', '-q', ...packages], { env })
}
