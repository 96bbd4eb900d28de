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
  private closed = false;

  constructor(size: number, private readonly maxQueue = 256) {
    const workerUrl = new URL('./analysis-worker.js', import.meta.url);
    const fromSources = import.meta.url.endsWith('.ts');
    if (fromSources) size = 0;
    for (let i = 0; i < size; i++) this.slots.push(this.spawn(workerUrl));
  }

  get threads(): number {
    return this.slots.length;
  }

  private spawn(url: URL): Slot {
    const slot: Slot = { worker: new Worker(url), job: null };
    slot.worker.on('message', (message: { id: number; result?: RecordingAnalysis; error?: { name: string; code?: string; message: string; where?: string } }) => {
      const job = slot.job;
      slot.job = null;
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
      const transfer = job.recording.channels.map((c) => c.samples.buffer as ArrayBuffer);
      slot.worker.postMessage({ id: job.id, recording: job.recording, options: job.options }, transfer);
    }
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
