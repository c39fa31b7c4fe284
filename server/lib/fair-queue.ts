/**
 * Runs async tasks at most `concurrency` at a time, taking turns between keys (callers): each caller waits in
 * its own line and the next free slot goes to the next caller in the round, so one caller sending many tasks
 * delays only its own.
 */
export class FairQueue {
  private readonly lines = new Map<string, Array<() => void>>();
  private running = 0;

  constructor(readonly concurrency = 1) {}

  /** Tasks of `key` waiting for a slot. */
  waiting(key: string): number {
    return this.lines.get(key)?.length ?? 0;
  }

  run<T>(key: string, task: () => Promise<T>): Promise<T> {
    return new Promise<T>((resolve, reject) => {
      const start = () => {
        this.running++;
        Promise.resolve()
          .then(task)
          .then(resolve, reject)
          .finally(() => {
            this.running--;
            this.next();
          });
      };
      const line = this.lines.get(key);
      if (line) line.push(start);
      else this.lines.set(key, [start]);
      this.next();
    });
  }

  private next() {
    while (this.running < this.concurrency && this.lines.size > 0) {
      const [key, line] = this.lines.entries().next().value as [string, Array<() => void>];
      const start = line.shift()!;
      // the caller goes to the back of the round (a Map keeps insertion order)
      this.lines.delete(key);
      if (line.length) this.lines.set(key, line);
      start();
    }
  }
}
