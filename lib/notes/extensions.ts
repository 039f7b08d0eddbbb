import type { Extensions } from '@tiptap/core';
import StarterKit from '@tiptap/starter-kit';
import Link from '@tiptap/extension-link';
import Mention, { type MentionOptions } from '@tiptap/extension-mention';
import { isSafeHref } from './links';

export type MentionSuggestion = MentionOptions['suggestion'];

/**
 * The one list of editor extensions for notes: the browser's editor, the server's validator and the
 * renderer all build their schema from it, so what can be typed is exactly what can be stored and
 * drawn. Only what the toolbar offers is in it: paragraphs, bold, italic, lists, links, mentions.
 * The browser plugs in the mention suggestion; the schema is the same without it.
 */
export function noteExtensionsWith(options: { mentionSuggestion?: Partial<MentionSuggestion> } = {}): Extensions {
  return [
    StarterKit.configure({
      heading: false,
      blockquote: false,
      code: false,
      codeBlock: false,
      horizontalRule: false,
      strike: false,
      underline: false,
      // Added below with the product's own rule for where a link may point.
      link: false,
    }),
    Link.configure({
      openOnClick: false,
      autolink: true,
      defaultProtocol: 'https',
      protocols: ['mailto'],
      isAllowedUri: (url) => isSafeHref(url),
      HTMLAttributes: { target: '_blank', rel: 'noopener noreferrer nofollow' },
    }),
    Mention.configure({
      HTMLAttributes: { class: 'note-mention' },
      renderText: ({ node }) => `@${node.attrs.label ?? 'someone'}`,
      ...(options.mentionSuggestion ? { suggestion: { char: '@', ...options.mentionSuggestion } } : {}),
    }),
  ];
}

export const noteExtensions: Extensions = noteExtensionsWith();
