import { env } from '../../config/env.ts';

/** Sets the page title; React 19 hoists <title> into the document head. */
export function Head({ title }: { title: string }) {
  return <title>{`${title} · ${env.appName}`}</title>;
}
