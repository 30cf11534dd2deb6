/**
 * Supplier price files: read a CSV, show what it would change, and apply exactly that on confirmation.
 *
 * Protocol: the upload parses the file and stores the preview in price_file_previews (id, SHA-256 of the file,
 * expiry). The apply step names the preview and the hash it was shown; the server applies the stored rows, not a
 * new reading of anything, and checks inside the transaction that every old price is still the one previewed.
 * Nothing lives in a server's memory, so any instance can apply a preview another instance made.
 *
 * reader.ts reads a file against the price list (pure), store.ts keeps previews and applies
 * them. This index keeps the names routes and tests import.
 */
export * from './reader';
export * from './store';
