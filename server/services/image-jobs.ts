/**
 * Decoding and resizing images is the heaviest work the server does: sharp runs it on libuv's small thread pool,
 * which file reads and other work share. All image work goes through this gate, so that a burst of large uploads
 * or PDFs waits its turn instead of taking every thread and stalling the rest of the server.
 * SHELLWRIGHT_IMAGE_JOBS sets how many run at once (default 2).
 */
const LIMIT = Math.max(1, Number(process.env.SHELLWRIGHT_IMAGE_JOBS) || 2);

let active = 0;
const waiting: (() => void)[] = [];

/** Runs `job` when a slot is free; jobs start in arrival order. */
export async function imageJob<T>(job: () => Promise<T>): Promise<T> {
  if (active < LIMIT) active++;
  // A slot is handed straight from the job that ends to the next in line, so the count never overshoots.
  else await new Promise<void>((resolve) => waiting.push(resolve));
  try {
    return await job();
  } finally {
    const next = waiting.shift();
    if (next) next();
    else active--;
  }
}
