'use client';

import { generateUploadButton } from '@uploadthing/react';
import type { EvidenceRouter } from '@/app/api/uploadthing/core';

/** The SDK's upload button, typed by our file router: one endpoint per kind of evidence. */
export const EvidenceUploadButton = generateUploadButton<EvidenceRouter>({ url: '/api/uploadthing' });
