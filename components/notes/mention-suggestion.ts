import type { MentionSuggestion } from '@/lib/notes/extensions';

export type MentionablePerson = { id: string; name: string; organisation: string };

/**
 * The "@" list of the note editor, drawn with plain DOM and textContent (never HTML): the names come
 * from the server, but nothing typed or stored is ever parsed as markup here either.
 */
export function mentionSuggestion(people: () => MentionablePerson[]): Partial<MentionSuggestion> {
  return {
    items: ({ query }) => {
      const q = query.toLowerCase();
      return people()
        .filter((p) => p.name.toLowerCase().includes(q))
        .slice(0, 6);
    },
    render: () => {
      let list: HTMLUListElement | null = null;
      let selected = 0;
      let current: { items: MentionablePerson[]; command: (attrs: { id: string; label: string }) => void } | null = null;

      const draw = () => {
        if (!list || !current) return;
        list.replaceChildren();
        if (current.items.length === 0) {
          const empty = document.createElement('li');
          empty.className = 'px-3 py-1 text-sm text-brine';
          empty.textContent = 'Nobody on this case by that name';
          list.append(empty);
          return;
        }
        current.items.forEach((person, i) => {
          const item = document.createElement('li');
          item.setAttribute('role', 'option');
          item.setAttribute('aria-selected', String(i === selected));
          item.className = `cursor-pointer px-3 py-1 text-sm ${i === selected ? 'bg-frost-soft text-frost-dark' : ''}`;
          const name = document.createElement('span');
          name.className = 'font-bold';
          name.textContent = person.name;
          const org = document.createElement('span');
          org.className = 'text-brine';
          org.textContent = ` · ${person.organisation}`;
          item.append(name, org);
          item.addEventListener('mousedown', (event) => {
            event.preventDefault();
            current?.command({ id: person.id, label: person.name });
          });
          list!.append(item);
        });
      };

      const place = (rect: DOMRect | null | undefined) => {
        if (!list || !rect) return;
        list.style.left = `${rect.left + window.scrollX}px`;
        list.style.top = `${rect.bottom + window.scrollY + 4}px`;
      };

      return {
        onStart: (props) => {
          list = document.createElement('ul');
          list.setAttribute('role', 'listbox');
          list.setAttribute('aria-label', 'People on this case');
          list.className = 'absolute z-50 min-w-56 rounded-control border border-line bg-white py-1 shadow-md';
          document.body.append(list);
          selected = 0;
          current = { items: props.items as MentionablePerson[], command: props.command as never };
          draw();
          place(props.clientRect?.());
        },
        onUpdate: (props) => {
          selected = 0;
          current = { items: props.items as MentionablePerson[], command: props.command as never };
          draw();
          place(props.clientRect?.());
        },
        onKeyDown: ({ event }) => {
          if (!current || current.items.length === 0) return false;
          if (event.key === 'ArrowDown' || event.key === 'ArrowUp') {
            selected = (selected + (event.key === 'ArrowDown' ? 1 : current.items.length - 1)) % current.items.length;
            draw();
            return true;
          }
          if (event.key === 'Enter' || event.key === 'Tab') {
            const person = current.items[selected];
            if (person) current.command({ id: person.id, label: person.name });
            return true;
          }
          if (event.key === 'Escape') {
            list?.remove();
            list = null;
            return true;
          }
          return false;
        },
        onExit: () => {
          list?.remove();
          list = null;
          current = null;
        },
      };
    },
  };
}
