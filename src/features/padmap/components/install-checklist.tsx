import { Card, CardTitle } from '@/components/ui/card';
import { SafetyCautions } from './safety-cautions';

/**
 * The install steps of a repad, printed with the map. The cautions sit in the glue-and-heat step,
 * where they are needed, not in a footnote.
 */
export function InstallChecklist({ selfLeveling, glued }: { selfLeveling: boolean; glued: boolean }) {
  return (
    <Card as="section" aria-labelledby="checklist-heading" className="space-y-3">
      <CardTitle id="checklist-heading">Install checklist</CardTitle>
      <ol className="list-decimal space-y-3 pl-5 text-sm text-ink-800 marker:font-semibold">
        <li>
          <strong className="text-ink-950">Measure every pad cup</strong>: inside diameter, depth from rim to floor, the tone-hole rim’s
          outside diameter, and whether the floor is flat or sunken in the centre.
        </li>
        <li>
          <strong className="text-ink-950">Choose each pad’s diameter{selfLeveling ? ' and stem height' : ''}</strong> from this map; clear every
          error and read every warning first.
        </li>
        <li>
          <strong className="text-ink-950">Check the fit</strong>
          {selfLeveling ? ': a self-leveling pad sits in its cup with the clearance shown and tilts freely; it may touch lightly but must not bind' : ''}
          {selfLeveling && glued ? '; ' : glued ? ': ' : ''}
          {glued ? 'a glued pad fits snug' : ''}.
        </li>
        <li>
          <strong className="text-ink-950">Order and reserve the pads</strong>: saving the map reserves them at this shop; request any shortage
          from the shop suggested beside it.
        </li>
        <li>
          <strong className="text-ink-950">{selfLeveling ? 'Glue only the stem' : 'Set the pads'}</strong>
          {selfLeveling
            ? ': a small drop on the mounting stem, never on the pad or its back, so the pad stays free to level itself'
            : ': warm the key cup and seat each pad in its cement'}
          {selfLeveling && glued ? '; glued pads are seated in warmed cement' : ''}.
          <SafetyCautions className="mt-3" />
        </li>
        <li>
          <strong className="text-ink-950">Check the seal</strong>: leak-test every key with a leak light or feeler, and regulate until each pad
          closes all round the tone hole.
        </li>
      </ol>
    </Card>
  );
}
