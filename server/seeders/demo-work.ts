/**
 * A demo workshop's customers, their pieces with drawings for condition photos, and estimates in different
 * states: `DEMO_WORK` for the first workshop, `DEMO_WORK_2` (smaller, measured in feet and inches) for the second.
 * All invented. Idempotent: keyed on the customers' e-mail addresses, within the workshop it runs under.
 */
import type { Sequelize } from 'sequelize';
import type { EstimateInput } from '@shared/schemas/calc';
import type { PieceKind } from '@shared/schemas/customers';
import type { Role } from '@shared/schemas/auth';
import { Customer, Piece, User } from '../models';
import { addPhotos } from '../services/photos';
import { createEstimate, reviseEstimate, setEstimateState } from '../services/estimates';
import { demoDrawing } from './demo-drawings';

export interface DemoJob {
  customer: { name: string; email: string; phone: string; address: string; notes?: string };
  piece: { kind: PieceKind; description: string; maker: string; year: number; serial: string | null; dimensions: Record<string, string>; conditionNotes: string };
  drawing: { kind: 'grand' | 'upright' | 'square' | 'table'; wood: string; captions: string[] };
  input: EstimateInput;
  revise?: EstimateInput;
  state: 'draft' | 'priced';
}

export const DEMO_WORK: DemoJob[] = [
  {
    customer: { name: 'Araminta Coldstream', email: 'araminta.coldstream@example.com', phone: '01632 960 233', address: '3 Orchard Rise\nHebbleton HB2 9IK', notes: 'Prefers contact by e-mail. Collection by arrangement.' },
    piece: {
      kind: 'grand',
      description: 'Medium grand in rosewood veneer',
      maker: 'Hartwell & Fenn',
      year: 1904,
      serial: '41 207',
      dimensions: { length: '6 ft 3 in', width: '148 cm', rimHeight: '33 cm' },
      conditionNotes: 'Old finish crazed and dull across the lid; water rings on the fall; veneer lifting at one corner of the cheek. Legs sound.',
    },
    drawing: { kind: 'grand', wood: '#7a3b22', captions: ['Whole case from the keyboard side', 'Lid, crazed finish'] },
    input: { piece: { template: 'grand', dimensions: { length: '6 ft 3 in', width: '148 cm', rimHeight: '33 cm' }, species: 'rosewood', veneered: true }, system: 'full-repolish', startDate: '2027-01-11' },
    revise: { piece: { template: 'grand', dimensions: { length: '6 ft 3 in', width: '148 cm', rimHeight: '33 cm' }, species: 'rosewood', veneered: true }, system: 'full-repolish', startDate: '2027-01-11', discountPct: 5 },
    state: 'priced',
  },
  {
    customer: { name: 'Barnaby Quillfeather', email: 'b.quillfeather@example.com', phone: '01632 960 547', address: 'The Old Forge\nStavenby ST9 1MC' },
    piece: {
      kind: 'upright',
      description: 'Walnut upright, overstrung',
      maker: 'Ellingham Piano Co.',
      year: 1923,
      serial: null,
      dimensions: { height: '127 cm', width: '150 cm', depth: '64 cm' },
      conditionNotes: 'Finish sound but worn through on the top and key slip; sun-faded on the left side.',
    },
    drawing: { kind: 'upright', wood: '#5b3a24', captions: ['Front, worn top'] },
    input: { piece: { template: 'upright', dimensions: { height: '127 cm', width: '150 cm', depth: '64 cm' }, species: 'walnut', veneered: true }, system: 're-body' },
    state: 'draft',
  },
  {
    customer: { name: 'Cordelia Ashgrove', email: 'cordelia.ashgrove@example.com', phone: '01632 960 812', address: '17 Mill Lane\nPennock PK5 3VO' },
    piece: {
      kind: 'square',
      description: 'Mahogany square piano',
      maker: 'Whitcombe of Tallow Street',
      year: 1828,
      serial: null,
      dimensions: { length: '168 cm', width: '61 cm', height: '86 cm' },
      conditionNotes: 'Heavy old varnish over shellac; stringing and cross-banding intact; one leg replaced at some time.',
    },
    drawing: { kind: 'square', wood: '#8a3f1f', captions: ['Case from the front'] },
    input: { piece: { template: 'square', dimensions: { length: '168 cm', width: '61 cm', height: '86 cm' }, species: 'mahogany', veneered: true }, system: 'full-repolish' },
    state: 'priced',
  },
  {
    customer: { name: 'Desmond Larkin-Vale', email: 'desmond.larkinvale@example.com', phone: '01632 960 095', address: 'Flat 2, 40 Quay Street\nBrackwater BW1 6CM' },
    piece: {
      kind: 'furniture',
      description: 'Satinwood side table, oval top',
      maker: 'Unknown',
      year: 1790,
      serial: null,
      dimensions: { length: '76 cm', width: '52 cm', height: '71 cm' },
      conditionNotes: 'Top bleached and ring-marked; legs good; a little polish left in the quirks.',
    },
    drawing: { kind: 'table', wood: '#c9a25a', captions: ['Top from above'] },
    input: { piece: { template: 'table', dimensions: { length: '76 cm', width: '52 cm', height: '71 cm' }, species: 'satinwood', veneered: true }, system: 'revive' },
    state: 'draft',
  },
];

/** The second demo workshop's customers: fewer, measured in feet and inches. */
export const DEMO_WORK_2: DemoJob[] = [
  {
    customer: { name: 'Evangeline Sharrowby', email: 'evangeline.sharrowby@example.net', phone: '01632 961 384', address: '11 Ropewalk Terrace\nQuernstone Parva QP1 4VK', notes: 'Telephone after six in the evening.' },
    piece: {
      kind: 'upright',
      description: 'Ebonised overstrung upright with brass candle sconces',
      maker: 'Haverill & Stoke',
      year: 1889,
      serial: '7 113',
      dimensions: { height: '4 ft 1 in', width: '4 ft 10 in', depth: '25 in' },
      conditionNotes: 'Polish dull and scratched on the fall and the top; sconces sound.',
    },
    drawing: { kind: 'upright', wood: '#2b2220', captions: ['Front, scratched fall'] },
    input: { piece: { template: 'upright', dimensions: { height: '4 ft 1 in', width: '4 ft 10 in', depth: '25 in' }, species: 'ebonised', veneered: false }, system: 're-body' },
    state: 'priced',
  },
  {
    customer: { name: 'Thaddeus Inglenook-Price', email: 'thaddeus.inglenookprice@example.net', phone: '01632 961 950', address: 'Wicket Farm, Long Drove\nSallowfield SF6 2CI' },
    piece: {
      kind: 'furniture',
      description: 'Figured walnut loo table, tilt top',
      maker: 'Unknown',
      year: 1855,
      serial: null,
      dimensions: { length: '4 ft 2 in', width: '3 ft 5 in', height: '28 in' },
      conditionNotes: 'Top sun-bleached at one side; heat mark in the middle; base good.',
    },
    drawing: { kind: 'table', wood: '#6b4426', captions: ['Top from above'] },
    input: { piece: { template: 'table', dimensions: { length: '4 ft 2 in', width: '3 ft 5 in', height: '28 in' }, species: 'walnut', veneered: true }, system: 'revive' },
    state: 'draft',
  },
];

/** The e-mail of a demo workshop's user of that role. */
export function demoEmailOf(users: readonly { email: string; role: Role }[], role: Role): string {
  const user = users.find((u) => u.role === role);
  if (!user) throw new Error(`the demo workshop has no ${role}`);
  return user.email;
}

/** Loads `jobs` under the current workshop, made by its estimator (a user of `users`). */
export async function loadDemoWork(
  sequelize: Sequelize,
  uploadsDir: string,
  demo: { users: readonly { email: string; role: Role }[]; jobs: readonly DemoJob[] },
  log: (m: string) => void = () => {},
): Promise<void> {
  const estimator = await User.findOne({ where: { email: demoEmailOf(demo.users, 'estimator') } });
  if (!estimator) return;
  for (const job of demo.jobs) {
    if (await Customer.findOne({ where: { email: job.customer.email } })) continue;
    const customer = await Customer.create({ ...job.customer, notes: job.customer.notes ?? null });
    const piece = await Piece.create({ customerId: customer.id, ...job.piece });
    const pictures = await Promise.all(job.drawing.captions.map((c) => demoDrawing(job.drawing.kind, `${job.piece.description}: ${c}`, job.drawing.wood)));
    await addPhotos(sequelize, uploadsDir, estimator.id, piece.id, pictures.map((buffer, i) => ({ buffer, originalname: `demo-${i + 1}.png` })), job.drawing.captions);
    const estimate = await createEstimate(sequelize, estimator.id, { customerId: customer.id, pieceId: piece.id, input: job.input, note: 'First measurement' });
    if (job.revise) await reviseEstimate(sequelize, estimator.id, estimate.id, { baseRevision: 1, input: job.revise, note: 'Loyal customer: 5 % off' });
    if (job.state === 'priced') await setEstimateState(sequelize, estimator.id, estimate.id, 'priced');
    log(`${customer.name}: ${job.piece.description}, estimate ${estimate.number}`);
  }
}
