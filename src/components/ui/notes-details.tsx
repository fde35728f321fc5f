import { NoteText } from './note-text.tsx';

/** The server's notes on the data behind a KPI answer (gaps, substitutions, cut-offs), folded away. */
export function NotesDetails({ notes, className }: { notes: readonly string[] | undefined; className?: string }) {
  if (!notes || notes.length === 0) return null;
  return (
    <details className={className}>
      <summary className="cursor-pointer text-sm font-bold text-tide-700 hover:text-tide-800">Notes on the data ({notes.length})</summary>
      <ul className="mt-2 list-disc space-y-1 pl-6 text-sm text-basin-800">
        {notes.map((n) => (
          <li key={n}>
            <NoteText text={n} />
          </li>
        ))}
      </ul>
    </details>
  );
}
