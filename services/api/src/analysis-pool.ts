import { Worker } from 'node:worker_threads';
import type { Recording } from '@kinespec/signal';
import { analyse, type RecordingAnalysis } from './analysis.js';
import { problem } from './problems.js';

/*
 * Analyses run on worker threads so that the event loop keeps serving requests and every core works.
 * A pool of `size` threads, each running analysis-worker.js; jobs wait in one queue. With size 0, or
 * when the service runs from its TypeScript sources (tests), analysis runs inline on the caller's thread.
 * A full queue answers 503 with Retry-After rather than holding ever more bodies in memory.
 */

type Options = Parameters<typeof analyse>[1];

interface Pending {
  id: number;
  timer?: NodeJS.Timeout;
  recording: Recording;
  options: Options;
  resolve(result: RecordingAnalysis): void;
  reject(err: Error): void;
}

interface Slot {
  worker: Worker;
  job: Pending | null;
}

export class AnalysisPool {
  private readonly slots: Slot[] = [];
  private readonly queue: Pending[] = [];
  private nextId = 1;
  private readonly workerUrl = new URL('./analysis-worker.js', import.meta.url);
  private closed = false;

  /**
   * `timeoutMs`: an analysis running longer on a thread is abandoned (the thread is replaced) and answers
   * 503 analysis-timed-out; inline analyses (size 0, or from the sources) cannot be interrupted.
   */
  constructor(size: number, private readonly maxQueue = 256, private readonly timeoutMs = 60_000) {
    const fromSources = import.meta.url.endsWith('.ts');
    if (fromSources) size = 0;
    for (let i = 0; i < size; i++) this.slots.push(this.spawn(this.workerUrl));
  }

  get threads(): number {
    return this.slots.length;
  }

  /** Analyses waiting for a thread, and those running: the queue depth the metrics report. */
  get depth(): { waiting: number; running: number } {
    return { waiting: this.queue.length, running: this.slots.filter((s) => s.job !== null).length };
  }

  private spawn(url: URL): Slot {
    const slot: Slot = { worker: new Worker(url), job: null };
    slot.worker.on('message', (message: { id: number; result?: RecordingAnalysis; error?: { name: string; code?: string; message: string; where?: string } }) => {
      const job = slot.job;
      slot.job = null;
      if (job?.timer) clearTimeout(job.timer);
      if (job && job.id === message.id) {
        if (message.error) job.reject(Object.assign(new Error(message.error.message), message.error));
        else job.resolve(message.result!);
      }
      this.pump();
    });
    slot.worker.on('error', (err) => {
      // a crashed thread fails its job and is replaced
      const job = slot.job;
      slot.job = null;
      if (job?.timer) clearTimeout(job.timer);
      job?.reject(err);
      const i = this.slots.indexOf(slot);
      if (i >= 0 && !this.closed) this.slots[i] = this.spawn(url);
      this.pump();
    });
    slot.worker.unref();
    return slot;
  }

  private pump(): void {
    for (const slot of this.slots) {
      if (slot.job || this.queue.length === 0) continue;
      const job = this.queue.shift()!;
      slot.job = job;
      job.timer = setTimeout(() => this.abandon(slot, job), this.timeoutMs);
      job.timer.unref();
      const transfer = job.recording.channels.map((c) => c.samples.buffer as ArrayBuffer);
      slot.worker.postMessage({ id: job.id, recording: job.recording, options: job.options }, transfer);
    }
  }

  /** Ends a thread whose analysis overran its time, fails the job and starts a fresh thread in its place. */
  private abandon(slot: Slot, job: Pending): void {
    if (slot.job !== job) return;
    slot.job = null;
    const i = this.slots.indexOf(slot);
    slot.worker.removeAllListeners();
    void slot.worker.terminate();
    job.reject(problem('analysis-timed-out', `the analysis took longer than ${this.timeoutMs} ms (KINESPEC_ANALYSIS_TIMEOUT_MS)`, {
      headers: { 'retry-after': '30' },
    }));
    if (i >= 0 && !this.closed) this.slots[i] = this.spawn(this.workerUrl);
    this.pump();
  }

  /** Analyses a recording (its sample buffers move to the worker: do not use them afterwards). */
  run(recording: Recording, options: Options): Promise<RecordingAnalysis> {
    if (this.slots.length === 0) {
      try {
        return Promise.resolve(analyse(recording, options));
      } catch (err) {
        return Promise.reject(err as Error);
      }
    }
    if (this.closed) return Promise.reject(problem('service-unavailable', 'the service is stopping'));
    if (this.queue.length >= this.maxQueue) {
      return Promise.reject(problem('service-unavailable', 'every analysis thread is busy and the queue is full; retry shortly', { headers: { 'retry-after': '2' } }));
    }
    return new Promise((resolve, reject) => {
      this.queue.push({ id: this.nextId++, recording, options, resolve, reject });
      this.pump();
    });
  }

  async close(): Promise<void> {
    this.closed = true;
    for (const job of this.queue.splice(0)) job.reject(problem('service-unavailable', 'the service is stopping'));
    await Promise.all(this.slots.map((s) => s.worker.terminate()));
  }
}
