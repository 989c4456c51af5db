/**
 * Sends the Redis commands issued during this turn of the event loop in one socket write.
 *
 * ioredis writes every command to its socket at once, so the commands of one wait on the submission path
 * (two admission counts; the job, its id in the submitter's set and that set's expiry) cost one write system
 * call each; in a CPU profile of the API under the submission bench each such write took 20–40 µs of the event
 * loop (loopback TCP send and waking Redis), several times a JSON.parse of the request body.
 * Corking the socket (node:net's cork/uncork) until this turn's I/O callbacks have run (setImmediate) hands
 * them — and those of other requests handled in the same turn — to the kernel as one writev. The commands,
 * their order and their replies are unchanged, and nothing is held back longer than this turn: the replies
 * could not be read before the next turn anyway. Unlike ioredis's auto-pipelining, no batch waits for the
 * replies of an earlier one.
 */
import type { Redis } from 'ioredis';

/** Corks `redis`'s socket until the end of this event-loop turn; a connection without a live socket is left
 * alone (its commands go through ioredis's offline queue as before). */
export function sendInOneWrite(redis: Redis): void {
  const socket = redis.stream;
  if (!socket || socket.destroyed) return;
  socket.cork();
  setImmediate(() => socket.uncork());
}
