// A simulated device's trouble, said once: when it starts failing and when it is sending again,
// not once every reconnect attempt or reading in between.

export class TroubleLog {
  private reason: string | null = null;

  constructor(
    private readonly serial: string,
    private readonly log?: (line: string) => void,
  ) {}

  /** The device cannot send (refused login, lost broker, unacknowledged publish). */
  fail(reason: string): void {
    if (this.reason !== null) return;
    this.reason = reason;
    this.log?.(
      `[simulator] ${this.serial} cannot send: ${reason}; its readings are kept until it can, the other tanks carry on`,
    );
  }

  /** The device sent something again. */
  ok(): void {
    if (this.reason === null) return;
    this.reason = null;
    this.log?.(`[simulator] ${this.serial} is sending again`);
  }

  get failing(): boolean {
    return this.reason !== null;
  }
}
