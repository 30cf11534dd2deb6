/** The safety cautions every customer-facing page about the work carries, in plain words. */
export function safetyCautionTexts(): string[] {
  return [
    'Shellac polish and the spirit it is made with are flammable: the work is done away from flames and sparks.',
    'Rags wet with polish or oil can catch fire by themselves as they dry: the workshop spreads them out to dry or keeps them in a closed metal bin.',
    'Methylated spirit contains methanol, which is toxic: the workshop works with good ventilation.',
    'Local fire codes, the workplace-safety regulator and licensed practice come first: these notes do not replace them.',
  ];
}
