/**
 * Named steps with their own deadlines for long browser tests. A test whose waits add up to more than its own limit
 * says nothing when it hangs but "timed out"; run under `StepClock`, the stuck step names itself and the time every
 * earlier step took, which tells a slow machine from a hung page.
 */
export class StepTimeoutError extends Error {
  constructor(
    readonly step: string,
    readonly limitMs: number,
    readonly earlier: readonly { name: string; ms: number }[],
  ) {
    const before = earlier.length ? earlier.map((s) => `${s.name} ${(s.ms / 1000).toFixed(1)} s`).join(", ") : "none";
    super(`step "${step}" did not finish within ${(limitMs / 1000).toFixed(limitMs < 10_000 ? 1 : 0)} s (earlier steps: ${before})`);
    this.name = "StepTimeoutError";
  }
}

export class StepClock {
  private readonly done: { name: string; ms: number }[] = [];
  private spentMs = 0;

  /** `budgetMs`: the test's own limit; steps whose deadlines would pass it are refused at the start. */
  constructor(private readonly budgetMs: number) {}

  /** The steps finished so far and how long each took. */
  get finished(): readonly { name: string; ms: number }[] {
    return this.done;
  }

  async run<T>(name: string, limitMs: number, work: () => Promise<T>): Promise<T> {
    if (this.spentMs + limitMs > this.budgetMs) {
      throw new Error(`step "${name}": its ${limitMs} ms deadline would pass the test's budget of ${this.budgetMs} ms after ${this.spentMs} ms of earlier deadlines`);
    }
    this.spentMs += limitMs;
    const started = Date.now();
    let timer: ReturnType<typeof setTimeout> | undefined;
    const deadline = new Promise<never>((_, reject) => {
      timer = setTimeout(() => reject(new StepTimeoutError(name, limitMs, [...this.done])), limitMs);
    });
    try {
      const value = await Promise.race([work(), deadline]);
      this.done.push({ name, ms: Date.now() - started });
      return value;
    } finally {
      clearTimeout(timer);
    }
  }
}
