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

// The cautions where money decisions are made (issue 17, part 4): where Setwell's figures do not
// apply and who decides. Each is a rule of thumb that defers to the official guidance and the
// firm's accountant, in words for the firm (never printed for customers).

/** Beside the VAT boxes (the quarter page) and the firm's VAT settings. */
export const FLAT_RATE_CAUTION = 'These boxes are worked the standard way, from the VAT on each sale and purchase. They are not for the Flat Rate Scheme: a firm on it works its return from a flat percentage of its takings instead. If you are on it, or thinking of joining, check HMRC\'s guidance (VAT Notice 733) and ask your accountant.'

/** Beside "labour paid to others" (purchases of that kind, and the profit page). */
export const CIS_CONTRACTOR_CAUTION = 'Paying others for construction work (a labourer, another plasterer) can make the firm a CIS contractor as well as a subcontractor: then it must register as one, check each person with HMRC before paying them, take the deduction HMRC gives from their pay and send HMRC a return every month. Check HMRC\'s guidance (CIS 340) and ask your accountant before paying anyone for work on site.'

/** Beside purchases (the purchase form and the list). */
export const PURCHASE_VAT_CAUTION = 'VAT on a purchase can be reclaimed only with a valid VAT invoice or receipt from a VAT-registered seller, and only for what the firm uses for its business, not for private use. Without one, record the VAT as 0 and the whole amount as the cost. Check HMRC\'s guidance (VAT Notice 700) and ask your accountant.'

/** Beside the late-payment claim on the firm's invoice screen (not in the letter). */
export const CLAIM_REMEDY_CAUTION = 'Statutory interest and the fixed sum apply unless your contract with the customer sets its own substantial remedy for late payment (for example its own fair interest rate): then the contract\'s terms apply instead. Read the payment terms you agreed first, and check the government\'s guidance on late commercial payments with your accountant or a solicitor.'
