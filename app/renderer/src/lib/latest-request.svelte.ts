/**
 * Asks the backend again a moment after the last change, and keeps only the newest reply. The planning
 * screens simulate a week on every edit (about a second each): the pause lets a burst of edits make
 * one request, and a slower reply to an older request never overwrites a newer one.
 */
export class LatestRequest<I, O> {
  /** A request is on its way (the newest one). */
  busy = $state(false);
  private timer: ReturnType<typeof setTimeout> | null = null;
  private seq = 0;

  /**
   * @param call the backend method
   * @param delayMs the pause after the last change before asking
   * @param onReply called with the newest reply only; @param onFailure with the newest failure's message
   */
  constructor(
    private readonly call: (input: I) => Promise<O>,
    private readonly delayMs: number,
    private readonly onReply: (value: O) => void,
    private readonly onFailure: (message: string) => void,
  ) {}

  /**
   * Asks after the pause, replacing a request that has not been sent yet. `busy` is set at once, so
   * the figures on screen are marked as recomputing from the change, not only once the request is sent.
   */
  schedule(input: I): void {
    if (this.timer) clearTimeout(this.timer);
    this.busy = true;
    this.timer = setTimeout(() => {
      this.timer = null;
      void this.run(input);
    }, this.delayMs);
  }

  /** Asks now. */
  async run(input: I): Promise<void> {
    const mine = ++this.seq;
    this.busy = true;
    try {
      const value = await this.call(input);
      if (mine === this.seq) this.onReply(value);
    } catch (err) {
      if (mine === this.seq) this.onFailure((err as Error).message);
    } finally {
      if (mine === this.seq && this.timer === null) this.busy = false;
    }
  }

  /** Drops the pending request and any reply still to come (the screen is closing). */
  dispose(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    this.seq++;
    this.busy = false;
  }
}
