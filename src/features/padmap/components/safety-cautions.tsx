import type { Hazard } from '@shared/safety/hazards';
import { HazardCautions } from '@/components/ui/hazard-cautions';

/** The hazards of a repad's steps: taking the old pads out, gluing, heat, solvents, a rotary tool on the cups. */
export const REPAD_HAZARDS: Hazard[] = ['pad_removal', 'adhesive', 'heat_flame', 'solvent', 'abrasive_rotary'];

/** The repad's cautions, in the glue-and-heat step where they are needed. */
export function SafetyCautions({ className }: { className?: string }) {
  return <HazardCautions hazards={REPAD_HAZARDS} intro="Safety: adhesives, solvents, heat" className={className} />;
}
