/**
 * Gates for the heaviest work the server does, so that a burst of it waits its turn instead of stalling the rest:
 *
 * - image work (decoding and resizing with sharp) runs on libuv's small thread pool, which file reads and other
 *   work share; SHELLWRIGHT_IMAGE_JOBS sets how many run at once (default 2);
 * - a PDF is laid out synchronously on the one JavaScript thread: PDFs are made one at a time, so that other
 *   requests (the health check, pages) are answered between two PDFs rather than after a whole burst of them.
 */

/** A gate letting at most `limit` jobs run at once; jobs start in arrival order. */
export function jobGate(limit: number) {
  let active = 0;
  const waiting: (() => void)[] = [];
  return async function run<T>(job: () => Promise<T>): Promise<T> {
    if (active < limit) active++;
    // A slot is handed straight from the job that ends to the next in line, so the count never overshoots.
    else await new Promise<void>((resolve) => waiting.push(resolve));
    try {
      return await job();
    } finally {
      const next = waiting.shift();
      if (next) next();
      else active--;
    }
  };
}

export const imageJob = jobGate(Math.max(1, Number(process.env.SHELLWRIGHT_IMAGE_JOBS) || 2));
export const pdfJob = jobGate(1);
