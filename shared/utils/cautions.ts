// The cautions shown beside the figures of a job that drive a decision: the set plan, the
// materials against the estimate, the drying before decorating, and the day sheet. Each says it
// is a rule of thumb and defers to the Building Regulations where they apply and good trade practice
// (../shared/DOMAIN.md, "Cautions the product shows"). One copy, so the job screen, the day
// sheet and the API say the same words. Pure.

export const JOB_CAUTIONS = {
  /** Beside the set plan (the job screen and the day sheet). */
  plan: 'The set plan is a rule of thumb from what was recorded on the visit, not engineering advice: check the walls on the day, and follow the Building Regulations where they apply, the plaster maker\'s instructions and good trade practice.',
  /** Beside the materials used against the estimate. */
  materials: 'Quantities are rules of thumb from the measurements (in packs: bags, lengths, rolls), not a specification: check them against the plaster maker\'s coverage, the Building Regulations where they apply and good trade practice before ordering.',
  /** Beside the "ready to decorate" dates. */
  drying: 'Drying varies with the weather, heating and ventilation: this date is a rule of thumb, not a promise. Check the plaster has dried to an even pale colour before decorating, and follow the paint maker\'s advice, the Building Regulations where they apply and good trade practice.',
  /** On the printable day sheet, after the plan. */
  site: [
    'Wet plaster is alkaline: gloves and eye protection when mixing; wash splashes off skin at once. Keep dust down when sanding or cutting out.',
    'Textured coatings and old boards may contain asbestos: do not sand, scrape or drill them until a sample has been tested by an accredited surveyor or laboratory. Licensable asbestos is removed only by a licensed contractor (HSE guidance).',
    'Isolate or protect live electrics before wetting walls round sockets and switches; use proper access equipment for ceilings and stairwells.',
  ],
} as const
