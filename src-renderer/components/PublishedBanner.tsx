import { momentWords } from './format.ts';
/** Says, above a published edition and its shelves, that it is frozen and how to change what it shows. */
export function PublishedBanner(props: { label: string; publishedAt: number | null }) {
  const when = props.publishedAt ? ` on ${momentWords(props.publishedAt)}` : '';
  return (
    <p className="banner" role="note" aria-label="Read-only edition">
      {props.label} was published{when} and is read-only: its shelves can be viewed, compared and exported, not changed. To change them, start a new
      edition copied from this one on the Editions screen.
    </p>
  );
}
