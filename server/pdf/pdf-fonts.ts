/**
 * Lora for PDFs: the full TTF files shipped by @expo-google-fonts/lora (pdfkit cannot use the woff2 subsets of
 * @fontsource). Paths are resolved from the installed package at run time and the bytes read once.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);

/** The faces the documents use, by the name they are registered under in pdfkit. */
export const LORA = {
  regular: 'Lora',
  italic: 'Lora-Italic',
  medium: 'Lora-Medium',
  semibold: 'Lora-SemiBold',
  semiboldItalic: 'Lora-SemiBoldItalic',
  bold: 'Lora-Bold',
} as const;

export type LoraFace = (typeof LORA)[keyof typeof LORA];

const FILES: Record<LoraFace, string> = {
  [LORA.regular]: '400Regular/Lora_400Regular.ttf',
  [LORA.italic]: '400Regular_Italic/Lora_400Regular_Italic.ttf',
  [LORA.medium]: '500Medium/Lora_500Medium.ttf',
  [LORA.semibold]: '600SemiBold/Lora_600SemiBold.ttf',
  [LORA.semiboldItalic]: '600SemiBold_Italic/Lora_600SemiBold_Italic.ttf',
  [LORA.bold]: '700Bold/Lora_700Bold.ttf',
};

let cache: Map<LoraFace, Buffer> | null = null;

/** The Lora faces' bytes, read from the package on first use. */
export function loraFonts(): ReadonlyMap<LoraFace, Buffer> {
  if (!cache) {
    const loaded = new Map<LoraFace, Buffer>();
    for (const [face, file] of Object.entries(FILES) as [LoraFace, string][]) {
      loaded.set(face, readFileSync(require.resolve(`@expo-google-fonts/lora/${file}`)));
    }
    cache = loaded;
  }
  return cache;
}

/** Registers every Lora face on a pdfkit document. */
export function registerLora(doc: PDFKit.PDFDocument): void {
  for (const [face, bytes] of loraFonts()) doc.registerFont(face, bytes);
}
