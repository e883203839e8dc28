import type { LimitStatus } from '@shared/solver/types';

/** One sentence per limit status: what it means for the result (glossary: status words). */
export const STATUS_EXPLANATION: Record<LimitStatus, string> = {
  detached:
    'A compression turns the flow more than an attached oblique shock can, so the shock stands off the body and the flow behind it is partly subsonic.',
  subsonic: 'The flow behind a shock is subsonic, so disturbances travel upstream and the facet-by-facet march no longer holds.',
  vacuum:
    'An expansion would need more turning than the Prandtl-Meyer limit allows: the pressure falls to zero there and stays zero to the trailing edge, and the coefficients are given with that limiting pressure.',
  blunt: 'A vertical nose or tail face leaves no sharp edge for attached waves; the method needs a sharp nose and tail, and neither thin-section theory applies to such a face.',
};
