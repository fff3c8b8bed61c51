// autocannon setupRequest for the booking run: every request takes the next (household, window)
// from the JSON file named by BENCH_BOOKING_TARGETS, so no two requests book the same thing.
// CommonJS because autocannon require()s it, in its worker thread when it runs in one.
const { readFileSync } = require('node:fs');

let targets = [];
let loadedFrom = '';
let next = 0;

module.exports = function nextBooking(request) {
  // Run in process, the module outlives one run: a new file is a new list.
  const file = process.env.BENCH_BOOKING_TARGETS;
  if (file !== loadedFrom) {
    targets = JSON.parse(readFileSync(file, 'utf8'));
    loadedFrom = file;
    next = 0;
  }
  const t = targets[next++ % targets.length];
  request.headers = { ...request.headers, cookie: t.cookie, 'x-xsrf-token': t.csrf, 'content-type': 'application/json' };
  request.body = JSON.stringify(t.body);
  return request;
};
