import { EventEmitter } from 'node:events';

/** Emits 'queued' after a transaction that queued mail commits, so this process's worker sends at once. */
export const outboxQueued = new EventEmitter();
outboxQueued.setMaxListeners(50);
