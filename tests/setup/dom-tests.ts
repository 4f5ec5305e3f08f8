import { afterEach } from 'vitest';

// Setup file of every test file (run per file, also with modules kept across files): in the files
// that run in jsdom (the client's form tests), React Testing Library unmounts what a test rendered
// after it, and findBy…/waitFor wait up to 5 s for the page to commit after a click (a loaded
// machine can pass the library's 1-second default; the bound is reached only when the awaited text
// never comes). Files in Node's environment load nothing of it.
if (typeof document !== 'undefined') {
  const { cleanup, configure } = await import('@testing-library/react');
  configure({ asyncUtilTimeout: 5_000 });
  afterEach(() => cleanup());
  // jsdom has the <dialog> element but not its methods: showModal() and close() here only set and
  // clear `open`, enough for the app's Dialog (components/dialog.tsx), which renders its body only
  // while open. What a browser adds (the inert page behind, the top layer) is for the browser tests.
  const dialog = HTMLDialogElement.prototype;
  if (typeof dialog.showModal !== 'function') {
    dialog.showModal = function showModal(this: HTMLDialogElement) {
      this.open = true;
    };
    dialog.close = function close(this: HTMLDialogElement) {
      this.open = false;
    };
  }
}
