import { ConfigError } from './config.ts';

/**
 * What the service and the queue worker do as processes: read their configuration once at start,
 * and stop cleanly on SIGINT or SIGTERM.
 */

/** The configuration `load` reads; a ConfigError is printed to stderr and the process exits with 2. */
export function configOrExit<T>(load: () => T): T {
  try {
    return load();
  } catch (error) {
    if (error instanceof ConfigError) {
      process.stderr.write(`configuration error: ${error.message}\n`);
      process.exit(2);
    }
    throw error;
  }
}

/** On the first SIGINT or SIGTERM: `announce(signal)`, then `close()`; exits 0, or 1 when closing fails. */
export function closeOnSignals(
  announce: (signal: NodeJS.Signals) => void,
  close: () => Promise<unknown>,
): void {
  for (const signal of ['SIGINT', 'SIGTERM'] as const) {
    process.once(signal, () => {
      announce(signal);
      close().then(
        () => process.exit(0),
        () => process.exit(1),
      );
    });
  }
}
