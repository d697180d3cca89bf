/**
 * A problem at start-up that the person running the command can fix (port in
 * use, PostgreSQL missing, a folder owned by someone else). Printed as one
 * line, without a stack trace.
 */
export class StartupError extends Error {
  override name = "StartupError";
}

/** Prints a start-up failure as one line and exits; unexpected errors keep their stack only with DEBUG set. */
export function exitWithStartupError(error: unknown): never {
  if (error instanceof StartupError) {
    console.error(`runwright: ${error.message}`);
  } else {
    const message = error instanceof Error ? error.message : String(error);
    console.error(`runwright: ${message}`);
    if (process.env.DEBUG && error instanceof Error) console.error(error.stack);
  }
  process.exit(1);
}
