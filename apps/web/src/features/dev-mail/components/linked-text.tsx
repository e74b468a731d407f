// A plain-text e-mail body with its web addresses turned into links, so a set-password link can be followed.
import { Fragment } from 'react';

const urlPattern = /(https?:\/\/[^\s<>"]+[^\s<>".,;:!?)\]])/g;

export function splitLinks(text: string): Array<{ text: string; href?: string }> {
  return text
    .split(urlPattern)
    .filter((part) => part !== '')
    .map((part) => (/^https?:\/\//.test(part) ? { text: part, href: part } : { text: part }));
}

export function LinkedText({ text }: { text: string }) {
  return (
    <pre className="whitespace-pre-wrap break-words font-sans text-sm leading-relaxed text-stone-900">
      {splitLinks(text).map((part, index) => (
        <Fragment key={index}>
          {part.href ? (
            <a href={part.href} className="font-semibold text-accent-700 underline break-all">
              {part.text}
            </a>
          ) : (
            part.text
          )}
        </Fragment>
      ))}
    </pre>
  );
}
