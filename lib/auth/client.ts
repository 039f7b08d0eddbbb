'use client';

import { createAuthClient } from 'better-auth/react';
import { adminClient } from 'better-auth/client/plugins';

/** The browser's side of better-auth: sign-in and password reset go over HTTP, where rate limits apply. */
export const authClient = createAuthClient({ plugins: [adminClient()] });
