// Test-only worker thread: sends one request to the warm server and wakes the waiting test thread.
// The test thread blocks on Atomics.wait, so `trellis()` in the tests stays synchronous.
import { connect } from 'node:net';
import { parentPort } from 'node:worker_threads';

parentPort.on('message', ({ socketPath, request, flag }) => {
  const view = new Int32Array(flag);
  const done = (code) => {
    Atomics.store(view, 0, code);
    Atomics.notify(view, 0);
  };
  const socket = connect(socketPath);
  let answered = false;
  socket.on('connect', () => socket.write(JSON.stringify(request) + '\n'));
  socket.on('data', () => {
    answered = true;
  });
  socket.on('close', () => done(answered ? 1 : 2));
  socket.on('error', () => undefined); // 'close' follows and reports the failure
});
