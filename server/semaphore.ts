/** Why a caller was not let in: too many already waiting, or it waited too long. */
export class SemaphoreRefusal extends Error {
  constructor(readonly reason: "queue_full" | "timeout") {
    super(reason === "queue_full" ? "too many callers are waiting" : "waited too long for a turn");
    this.name = "SemaphoreRefusal";
  }
}

/**
 * At most `limit` holders at once; up to `queue` callers wait their turn in arrival order, and
 * the next one is refused at once (the caller answers 503/429 with Retry-After rather than
 * letting work pile up in memory).
 */
export class Semaphore {
  private held = 0;
  private readonly waiting: { grant: () => void; timer?: NodeJS.Timeout }[] = [];

  constructor(
    readonly limit: number,
    readonly queue: number,
  ) {}

  get holders(): number {
    return this.held;
  }

  get waiters(): number {
    return this.waiting.length;
  }

  /** A turn: resolves with the function that gives it back (call it exactly once). */
  acquire(timeoutMs?: number): Promise<() => void> {
    if (this.held < this.limit && this.waiting.length === 0) return Promise.resolve(this.take());
    if (this.waiting.length >= this.queue) return Promise.reject(new SemaphoreRefusal("queue_full"));
    return new Promise((resolve, reject) => {
      const entry: { grant: () => void; timer?: NodeJS.Timeout } = { grant: () => resolve(this.take()) };
      if (timeoutMs !== undefined) {
        entry.timer = setTimeout(() => {
          const at = this.waiting.indexOf(entry);
          if (at >= 0) this.waiting.splice(at, 1);
          reject(new SemaphoreRefusal("timeout"));
        }, timeoutMs);
        entry.timer.unref();
      }
      this.waiting.push(entry);
    });
  }

  private take(): () => void {
    this.held++;
    let given = false;
    return () => {
      if (given) return;
      given = true;
      this.held--;
      const next = this.waiting.shift();
      if (next) {
        if (next.timer) clearTimeout(next.timer);
        next.grant();
      }
    };
  }
}
