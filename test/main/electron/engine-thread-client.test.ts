// The main process's client of the engine thread, over a fake worker that answers like the real one.
import { EventEmitter } from 'node:events';
import type { Worker } from 'node:worker_threads';
import { describe, expect, it } from 'vitest';
import { createThreadEngine } from '../../../main/electron/engine-thread-client';
import { answerRequest, type WorkerRequest } from '../../../shared/api/message-channel';
import { DEFAULT_ANALYSIS_SETTINGS } from '../../../shared/workspace/settings';
import { testEngineHost } from '../../fixtures/api/test-engine-host';

const handlers = testEngineHost({ version: '1', runtime: 'electron', platform: 'linux' });

class FakeWorker extends EventEmitter {
  postMessage(request: WorkerRequest): void {
    void answerRequest(handlers, request).then((reply) => this.emit('message', reply));
  }
  async terminate(): Promise<number> {
    this.emit('exit', 1);
    return 1;
  }
}

describe('createThreadEngine', () => {
  it('forwards the engine requests and checks the replies', async () => {
    const engine = createThreadEngine('engine-thread.cjs', () => new FakeWorker() as unknown as Worker);
    const a = await engine.analyzeTrips('traveler,trip,flight,from,depart,to,arrive\nAda,T,UA 1,DFW,2026-03-08 15:10,ORD,17:35\nAda,T,UA 2,ORD,2026-03-08 18:20,BOS,21:40\n', DEFAULT_ANALYSIS_SETTINGS);
    expect(a.trips[0]?.connections[0]?.pMake).toBeGreaterThan(0);
    const curve = await engine.connectionCurve(a.analysisId, a.trips[0]!.id, 0);
    expect(curve.points.length).toBeGreaterThan(10);
  });

  it('fails waiting calls when the thread dies, and starts a new thread on the next call', async () => {
    let made = 0;
    const silent = new (class extends FakeWorker {
      override postMessage(): void {
        setTimeout(() => this.emit('exit', 3), 0);
      }
    })();
    const engine = createThreadEngine('engine-thread.cjs', () => (made++ === 0 ? silent : new FakeWorker()) as unknown as Worker);
    await expect(engine.getBundleInfo()).rejects.toThrow(/engine thread stopped \(exit code 3\)/);
    await expect(engine.getBundleInfo()).resolves.toMatchObject({ bundle: { id: expect.any(String) } });
    expect(made).toBe(2);
  });
});
