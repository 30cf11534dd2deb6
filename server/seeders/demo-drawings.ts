/**
 * Drawings made for the demo: simple line pictures of the invented pieces, rendered to PNG with sharp, standing in
 * for condition photos. No real photographs, makers or marks.
 */
import sharp from 'sharp';

const frame = (body: string, caption: string, wood: string) => `
<svg xmlns="http://www.w3.org/2000/svg" width="960" height="640" viewBox="0 0 960 640">
  <defs>
    <linearGradient id="wood" x1="0" x2="1" y1="0" y2="1">
      <stop offset="0" stop-color="${wood}"/><stop offset="1" stop-color="#2a1a11"/>
    </linearGradient>
    <pattern id="grain" width="18" height="18" patternUnits="userSpaceOnUse" patternTransform="rotate(12)">
      <line x1="0" y1="0" x2="0" y2="18" stroke="#ffffff" stroke-opacity="0.06" stroke-width="6"/>
    </pattern>
  </defs>
  <rect width="960" height="640" fill="#efe4cf"/>
  <rect x="0" y="520" width="960" height="120" fill="#d9c7a5"/>
  ${body}
  <text x="32" y="604" font-family="DejaVu Sans, sans-serif" font-size="26" fill="#3a2418">${caption}</text>
</svg>`;

const DRAWINGS: Record<string, string> = {
  grand: `
    <path d="M180 250 L180 390 L640 390 C760 390 820 350 830 300 C840 240 760 220 650 230 C560 238 520 250 420 250 Z" fill="url(#wood)" stroke="#1a0f09" stroke-width="4"/>
    <path d="M180 250 L180 390 L640 390 C760 390 820 350 830 300 C840 240 760 220 650 230 C560 238 520 250 420 250 Z" fill="url(#grain)"/>
    <path d="M190 250 L420 120 L430 250 Z" fill="url(#wood)" stroke="#1a0f09" stroke-width="3"/>
    <rect x="200" y="390" width="22" height="130" fill="#2a1a11"/><rect x="600" y="390" width="22" height="130" fill="#2a1a11"/>
    <rect x="760" y="360" width="22" height="160" fill="#2a1a11"/>
    <rect x="380" y="390" width="70" height="100" fill="none" stroke="#2a1a11" stroke-width="6"/>
    <path d="M300 300 q20 -10 40 0 M560 330 q30 -14 60 0" stroke="#f7e7c6" stroke-opacity="0.5" stroke-width="3" fill="none"/>`,
  upright: `
    <rect x="300" y="110" width="380" height="300" fill="url(#wood)" stroke="#1a0f09" stroke-width="4"/>
    <rect x="300" y="110" width="380" height="300" fill="url(#grain)"/>
    <rect x="290" y="300" width="400" height="40" fill="#3a2418"/>
    <rect x="310" y="340" width="360" height="26" fill="#f5f0e6" stroke="#1a0f09"/>
    <rect x="300" y="366" width="380" height="154" fill="url(#wood)" stroke="#1a0f09" stroke-width="4"/>
    <rect x="320" y="380" width="20" height="140" fill="#2a1a11"/><rect x="640" y="380" width="20" height="140" fill="#2a1a11"/>
    <circle cx="460" cy="200" r="34" fill="none" stroke="#f7e7c6" stroke-opacity="0.4" stroke-width="5"/>`,
  square: `
    <rect x="170" y="230" width="620" height="150" rx="6" fill="url(#wood)" stroke="#1a0f09" stroke-width="4"/>
    <rect x="170" y="230" width="620" height="150" fill="url(#grain)"/>
    <rect x="200" y="380" width="24" height="140" fill="#2a1a11"/><rect x="740" y="380" width="24" height="140" fill="#2a1a11"/>
    <rect x="300" y="380" width="24" height="140" fill="#2a1a11"/><rect x="640" y="380" width="24" height="140" fill="#2a1a11"/>
    <path d="M230 300 L420 300" stroke="#f7e7c6" stroke-opacity="0.45" stroke-width="4"/>
    <path d="M560 260 l40 40 M600 260 l-40 40" stroke="#f7e7c6" stroke-opacity="0.35" stroke-width="3"/>`,
  table: `
    <ellipse cx="480" cy="260" rx="250" ry="60" fill="url(#wood)" stroke="#1a0f09" stroke-width="4"/>
    <ellipse cx="480" cy="260" rx="250" ry="60" fill="url(#grain)"/>
    <path d="M250 270 L290 520 M710 270 L670 520 M400 300 L410 520 M560 300 L550 520" stroke="#2a1a11" stroke-width="16"/>
    <path d="M380 250 q60 -20 120 0" stroke="#ffffff" stroke-opacity="0.5" stroke-width="4" fill="none"/>`,
};

/** A PNG drawing of a piece kind with a caption. */
export async function demoDrawing(kind: keyof typeof DRAWINGS, caption: string, wood: string): Promise<Buffer> {
  const svg = frame(DRAWINGS[kind]!, caption, wood);
  return sharp(Buffer.from(svg)).png().toBuffer();
}
