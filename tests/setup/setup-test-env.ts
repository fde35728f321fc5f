import { afterEach, beforeEach, vi } from 'vitest';

// A console.error during a test fails it, unless the test calls allowConsoleError() first.
let allowed = false;
let calls: unknown[][] = [];

export function allowConsoleError() {
  allowed = true;
}

beforeEach(() => {
  allowed = false;
  calls = [];
  vi.spyOn(console, 'error').mockImplementation((...args: unknown[]) => {
    calls.push(args);
  });
});

afterEach(() => {
  vi.mocked(console.error).mockRestore();
  if (!allowed && calls.length > 0) {
    throw new Error(`console.error was called during the test:\n${calls.map((a) => a.map(String).join(' ')).join('\n')}`);
  }
});
