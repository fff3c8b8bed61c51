// Availability engine: arrival windows, booking plans and the member priority promise.
export * from './scheduling/types';
export * from './scheduling/engine';
export { wallClockOccurrences } from './scheduling/clock';
