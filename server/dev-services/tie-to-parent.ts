/**
 * Reports the bound ports to the parent (`npm start`) and stops with it: on SIGINT/SIGTERM, and when the
 * IPC channel to the parent closes — which is how a stand-in learns that its parent crashed or was killed,
 * so nothing `npm start` started is left running.
 */
export function tieToParent(ports: Record<string, number>, close: () => Promise<unknown>) {
  let stopping = false;
  const stop = () => {
    if (stopping) return;
    stopping = true;
    const hard = setTimeout(() => process.exit(0), 3_000);
    hard.unref();
    void close().finally(() => process.exit(0));
  };
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
  if (process.send) {
    process.send({ ports });
    process.on("disconnect", stop);
  }
}
