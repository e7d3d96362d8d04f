import type { InstrumentFamily } from '../domain.js';

/**
 * The padded keys of each family, in the order a technician works down the instrument, with the
 * trade's names. `id` is stable and stored in pad maps (so maps of one model can be compared key by
 * key); `name` is what the screen shows. `optional` keys exist only on some models (a baritone's
 * low A, a flute's B foot) and start empty.
 */
export type KeyGroup = 'main' | 'side' | 'palm' | 'octave' | 'trill' | 'foot' | 'thumb' | 'register';

export interface PadKey {
  id: string;
  name: string;
  group: KeyGroup;
  optional?: boolean;
}

const k = (id: string, name: string, group: KeyGroup = 'main', optional = false): PadKey =>
  optional ? { id, name, group, optional } : { id, name, group };

const SAXOPHONE_MAIN: PadKey[] = [
  k('low_bb', 'Low B♭'),
  k('low_b', 'Low B'),
  k('low_cs', 'Low C♯'),
  k('low_c', 'Low C'),
  k('low_eb', 'E♭'),
  k('d', 'D'),
  k('c', 'C'),
  k('b', 'B'),
  k('a', 'A'),
  k('g', 'G'),
  k('gs', 'G♯'),
  k('f', 'F'),
  k('e', 'E'),
  k('fs', 'F♯'),
  k('bis_bb', 'Bis B♭'),
];

const SAXOPHONE_UPPER: PadKey[] = [
  k('side_bb', 'Side B♭', 'side'),
  k('side_c', 'Side C', 'side'),
  k('high_e', 'High E', 'side'),
  k('high_fs', 'High F♯', 'side'),
  k('palm_d', 'Palm D', 'palm'),
  k('palm_eb', 'Palm E♭', 'palm'),
  k('palm_f', 'Palm F', 'palm'),
  k('front_f', 'Front F', 'palm'),
  k('octave_body', 'Body octave pip', 'octave'),
  k('octave_neck', 'Neck octave key', 'octave'),
];

const FLUTE_BODY: PadKey[] = [
  k('d', 'D'),
  k('e', 'E'),
  k('f', 'F'),
  k('fs', 'F♯'),
  k('g', 'G'),
  k('gs', 'G♯'),
  k('a', 'A'),
  k('thumb_bb', 'Thumb B♭', 'thumb'),
  k('thumb_b', 'Thumb B', 'thumb'),
  k('c', 'C'),
  k('cs', 'C♯'),
  k('trill_d', 'D trill', 'trill'),
  k('trill_ds', 'D♯ trill', 'trill'),
  k('split_e', 'Split E', 'main', true),
];

const CLARINET: PadKey[] = [
  k('register', 'Register key', 'register'),
  k('throat_a', 'Throat A'),
  k('throat_gs', 'Throat G♯'),
  k('trill_1', 'Side trill 1 (top)', 'trill'),
  k('trill_2', 'Side trill 2', 'trill'),
  k('trill_3', 'Side trill 3', 'trill'),
  k('trill_4', 'Side trill 4 (bottom)', 'trill'),
  k('eb_bb_sliver', 'E♭/B♭ sliver key', 'side'),
  k('cs_gs', 'C♯/G♯'),
  k('bb_f_ring', 'B♭/F under the rings'),
  k('ab_eb', 'A♭/E♭'),
  k('fs_cs', 'F♯/C♯'),
  k('f_c', 'F/C'),
  k('e_b', 'E/B'),
];

export const PAD_KEYS_BY_FAMILY: Partial<Record<InstrumentFamily, PadKey[]>> = {
  soprano_saxophone: [...SAXOPHONE_MAIN, ...SAXOPHONE_UPPER, k('high_g', 'High G', 'palm', true)],
  alto_saxophone: [...SAXOPHONE_MAIN, ...SAXOPHONE_UPPER],
  tenor_saxophone: [...SAXOPHONE_MAIN, ...SAXOPHONE_UPPER],
  baritone_saxophone: [k('low_a', 'Low A', 'main', true), ...SAXOPHONE_MAIN, ...SAXOPHONE_UPPER],
  flute: [
    k('low_b', 'Low B', 'foot', true),
    k('gizmo', 'Gizmo', 'foot', true),
    k('low_c', 'Low C', 'foot'),
    k('low_cs', 'Low C♯', 'foot'),
    k('low_ds', 'Low D♯', 'foot'),
    ...FLUTE_BODY,
  ],
  piccolo: [k('low_ds', 'D♯', 'main'), ...FLUTE_BODY.filter((key) => key.id !== 'split_e')],
  clarinet: CLARINET,
  bass_clarinet: [
    ...CLARINET,
    k('register_2', 'Second register key', 'register'),
    k('low_eb', 'Low E♭'),
    k('low_d', 'Low D', 'main', true),
    k('low_cs', 'Low C♯', 'main', true),
    k('low_c', 'Low C', 'main', true),
  ],
  oboe: [
    k('octave_1', 'First octave key', 'octave'),
    k('octave_2', 'Second octave key', 'octave'),
    k('a', 'A'),
    k('gs', 'G♯'),
    k('f', 'F'),
    k('f_resonance', 'F resonance'),
    k('forked_f', 'Forked F vent'),
    k('low_eb', 'Low E♭'),
    k('low_cs', 'Low C♯'),
    k('low_c', 'Low C'),
    k('low_b', 'Low B'),
    k('low_bb', 'Low B♭'),
  ],
  bassoon: [
    k('whisper', 'Whisper key'),
    k('low_bb', 'Low B♭'),
    k('low_b', 'Low B'),
    k('low_c', 'Low C'),
    k('low_cs', 'Low C♯'),
    k('low_d', 'Low D'),
    k('low_eb', 'Low E♭'),
    k('e', 'E'),
    k('fs', 'F♯'),
    k('gs', 'G♯'),
    k('bb', 'B♭'),
    k('high_a', 'High A vent', 'octave'),
    k('high_c', 'High C vent', 'octave'),
  ],
};

/** The keys a pad map of this family starts with; brass and unlisted families start empty. */
export function padKeysFor(family: string): PadKey[] {
  return PAD_KEYS_BY_FAMILY[family as InstrumentFamily] ?? [];
}

/** Families that play on pads; the pad map screen is offered for these. */
export function hasPadKeys(family: string): boolean {
  return padKeysFor(family).length > 0;
}

/** A key's display name: the family list's trade name, or what the technician typed for an extra key. */
export function keyName(family: string, keyId: string, typedName?: string | null): string {
  return padKeysFor(family).find((key) => key.id === keyId)?.name ?? typedName ?? keyId;
}
