// Runs before every web test file: unmount what a test rendered, forget its session and its mocks.
import { cleanup } from '@testing-library/react';
import { afterEach, vi } from 'vitest';
import { endSession } from '../lib/session.ts';

afterEach(() => {
  cleanup();
  endSession('signed-out');
  localStorage.clear();
  vi.unstubAllGlobals();
  vi.restoreAllMocks();
});
