/**
 * Loaded into every part the plant supervisor starts (`node --import tsx --import
 * scripts/lib/parent-watch.ts …`): when the supervisor is gone (killed with SIGKILL, say), the
 * part stops itself instead of running on as an orphan. It sends itself SIGTERM so the part's
 * own orderly stop runs, and exits outright if that has not finished within 7 s.
 */
const supervisor = Number(process.env.FERRISIGHT_SUPERVISOR_PID);
if (Number.isInteger(supervisor) && supervisor > 1) {
  const timer = setInterval(() => {
    // process.ppid is read afresh on every access: an orphan is re-parented to init or a subreaper.
    if (process.ppid === supervisor) return;
    clearInterval(timer);
    setTimeout(() => process.exit(1), 7000).unref();
    process.kill(process.pid, 'SIGTERM');
  }, 500);
  timer.unref();
}
export {};
