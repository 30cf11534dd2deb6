/**
 * Default wood species (seeded, owner-editable). Pore classes are common practice; the absorbency factors —
 * how much more polish the first coats take on bare wood — are from memory and meant to be tuned by the workshop.
 */
import type { Species } from '../../schemas/catalog';

/** The species a workshop starts with. */
export const DEFAULT_SPECIES: readonly Species[] = [
  // Open-pored: grain filling before a full gloss (common practice).
  { key: 'rosewood', name: 'Rosewood', pores: 'open', needsGrainFill: true, absorbency: 1.2 },
  { key: 'mahogany', name: 'Mahogany', pores: 'open', needsGrainFill: true, absorbency: 1.3 },
  { key: 'walnut', name: 'Walnut', pores: 'open', needsGrainFill: true, absorbency: 1.3 },
  { key: 'oak', name: 'Oak', pores: 'open', needsGrainFill: true, absorbency: 1.4 },
  { key: 'ash', name: 'Ash', pores: 'open', needsGrainFill: true, absorbency: 1.4 },
  { key: 'elm', name: 'Elm', pores: 'open', needsGrainFill: true, absorbency: 1.4 },
  { key: 'kingwood', name: 'Kingwood', pores: 'open', needsGrainFill: true, absorbency: 1.1 },
  // Closed-pored: no grain filling.
  { key: 'maple', name: 'Maple', pores: 'closed', needsGrainFill: false, absorbency: 1.1 },
  { key: 'satinwood', name: 'Satinwood', pores: 'closed', needsGrainFill: false, absorbency: 1.1 },
  { key: 'sycamore', name: 'Sycamore', pores: 'closed', needsGrainFill: false, absorbency: 1.2 },
  { key: 'cherry', name: 'Cherry', pores: 'closed', needsGrainFill: false, absorbency: 1.15 },
  { key: 'birch', name: 'Birch', pores: 'closed', needsGrainFill: false, absorbency: 1.2 },
  { key: 'pear', name: 'Pear', pores: 'closed', needsGrainFill: false, absorbency: 1.15 },
  // Ebonised: stained or dyed black, usually on a close-grained wood; the stain has sealed the surface.
  { key: 'ebonised', name: 'Ebonised', pores: 'ebonised', needsGrainFill: false, absorbency: 1.0 },
];
