import { cleanup, configure } from '@testing-library/react';
import { afterEach } from 'vitest';

// findBy…/waitFor give a debounced search or a query's answer up to 5 s (the library's 1 s is too
// short when the two cores are shared with PostgreSQL and other test workers); the test's own
// timeout (vite.config.ts) stays above it.
configure({ asyncUtilTimeout: 5_000 });

afterEach(() => cleanup());
