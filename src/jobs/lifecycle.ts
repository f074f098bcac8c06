import type { JobLog } from './job-log.ts';
import type { PlanQueue } from './plan-queue.ts';
import type { EntryKind, Scope, Store } from './store.ts';

export interface RetentionPolicy {
  /** Entries older than this are removed; 0 disables the age limit. */
  maxAgeHours: number;
  /** Oldest entries are removed until the stored total is at most this; 0 disables the size limit. */
  maxBytes: number;
  /** How often the cleanup runs, in milliseconds; 0 runs it only when asked (`runRetention`). */
  intervalMs: number;
}

export const defaultRetention: RetentionPolicy = {
  maxAgeHours: 168,
  maxBytes: 2 * 1024 ** 3,
  intervalMs: 10 * 60 * 1000,
};

export interface RetentionReport {
  removed: Array<{ kind: EntryKind; id: string }>;
  /** Stored bytes (as `Store.inventory` counts them) before and after. */
  bytesBefore: number;
  bytesAfter: number;
}

/**
 * What a user deletes is gone: deletions cascade from an input to everything made from it,
 * running plans are cancelled before their rows go, and the file is scrubbed afterwards.
 * Retention removes the oldest entries by the same path, never a queued or running plan or an
 * input such a plan reads.
 */
export class DataLifecycle {
  private timer: NodeJS.Timeout | null = null;

  constructor(
    private readonly store: Store,
    private readonly plans: PlanQueue,
    private readonly policy: RetentionPolicy,
    private readonly log: JobLog | undefined,
  ) {}

  /**
   * Deletes an entry the scope may see, with everything derived from it. Returns false when the
   * entry is unknown to that scope.
   */
  delete(kind: EntryKind, id: string, scope: Scope = 'all'): boolean {
    if (!this.store.visible(kind, id, scope)) return false;
    this.remove(kind, id);
    this.scrub();
    return true;
  }

  private scrub(): void {
    if (!this.store.scrub()) {
      this.log?.warn(
        'WAL checkpoint blocked by another reader: deleted pages stay in the WAL until the next one',
      );
    }
  }

  /** Applies the policy as of `now`; returns what it removed. */
  runRetention(now: Date = new Date()): RetentionReport {
    const entries = this.store.inventory();
    const bytesOf = new Map(entries.map((entry) => [`${entry.kind}:${entry.id}`, entry.bytes]));
    let total = entries.reduce((sum, entry) => sum + entry.bytes, 0);
    const bytesBefore = total;
    const cutoff =
      this.policy.maxAgeHours > 0
        ? new Date(now.getTime() - this.policy.maxAgeHours * 3600_000).toISOString()
        : null;
    const gone = new Set<string>();
    const removed: RetentionReport['removed'] = [];
    for (const entry of entries) {
      const key = `${entry.kind}:${entry.id}`;
      if (entry.pinned || gone.has(key)) continue;
      const tooOld = cutoff !== null && entry.createdAt < cutoff;
      const overSize = this.policy.maxBytes > 0 && total > this.policy.maxBytes;
      if (!tooOld && !overSize) continue;
      for (const item of this.remove(entry.kind, entry.id)) {
        const itemKey = `${item.kind}:${item.id}`;
        if (gone.has(itemKey)) continue;
        gone.add(itemKey);
        total -= bytesOf.get(itemKey) ?? 0;
        removed.push(item);
      }
    }
    if (removed.length > 0) {
      this.scrub();
      this.log?.info({ removed: removed.length, bytesBefore, bytesAfter: total }, 'retention cleanup');
    }
    return { removed, bytesBefore, bytesAfter: total };
  }

  /** Starts the periodic cleanup (unref'd: it never keeps the process alive). */
  start(): void {
    if (this.timer || this.policy.intervalMs <= 0) return;
    if (this.policy.maxAgeHours <= 0 && this.policy.maxBytes <= 0) return;
    this.timer = setInterval(() => this.runSafely(), this.policy.intervalMs);
    this.timer.unref();
    this.runSafely();
  }

  stop(): void {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
  }

  private runSafely(): void {
    try {
      if (this.store.isOpen) this.runRetention();
    } catch (error) {
      this.log?.error({ err: error }, 'retention cleanup failed');
    }
  }

  /** Cancels the queued or running plans among what goes, then deletes the rows. */
  private remove(kind: EntryKind, id: string): Array<{ kind: EntryKind; id: string }> {
    const plans =
      kind === 'plan'
        ? [id]
        : kind === 'result'
          ? []
          : this.store
              .holdersOf({ kind, id })
              .filter((holder) => holder.kind === 'plan')
              .map((holder) => holder.id);
    for (const planId of plans) this.plans.cancel(planId);
    return this.store.deleteCascade(kind, id);
  }
}
