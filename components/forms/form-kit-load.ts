// Apart from form-kit.tsx (which draws with react-native) so that schema-form.ts's resolver, and
// its tests under plain Node, load the kit without react-native.
export type FormKit = typeof import('./form-kit-impl');
/** The thenable fields React's `use` reads, set here too so a kit already loaded is used at once. */
type Loading = Promise<FormKit> & { status?: 'pending' | 'fulfilled' | 'rejected'; value?: FormKit };

let loading: Loading | undefined;

/**
 * react-hook-form and its zod resolver (form-kit-impl.ts), fetched once. Imported statically by
 * five screens' forms they would sit in __common, which the landing page loads too; behind import()
 * they are one chunk, asked for when a form is first drawn. Not sooner: the roster screen holds the
 * pattern and rules forms, and its result section (issue 19's "roster result" target) needs neither.
 */
export function loadFormKit(): Promise<FormKit> {
  if (!loading) {
    const started: Loading = import('./form-kit-impl');
    started.then(
      (kit) => Object.assign(started, { status: 'fulfilled', value: kit }),
      // Failing offline is answered where a form is drawn (use rethrows it), not as an unhandled
      // rejection; the next form drawn asks again.
      () => {
        loading = undefined;
      },
    );
    loading = started;
  }
  return loading;
}
