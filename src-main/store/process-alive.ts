/**
 * Whether a process with this id is running: signal 0 checks without sending (kill(2)); EPERM means it runs,
 * as another user. Used to tell a live writer's note (write-lock.ts) and a live run's temporary folder
 * (services/temp-folders.ts) from those a killed process left behind.
 */
export function processRunning(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === 'EPERM';
  }
}
