// Unmount what each test rendered so the next one starts from an empty document.
import { afterEach } from 'vitest';
import { cleanup } from '@testing-library/react';

afterEach(() => {
  cleanup();
});
