import { expect as baseExpect } from '@playwright/test';

/**
 * `expect` with a longer wait: on a loaded 2-core CI machine a page plus its API calls can take
 * several seconds the first time. Assertions still retry and pass as soon as they hold.
 */
export const expect = baseExpect.configure({ timeout: 15_000 });
