import { eq, sql } from 'drizzle-orm'
import { customers, enquiries, sites } from '../../../db/schema'
import { publicEnquirySchema } from '#shared/schemas/enquiry'
import { formKeyParam } from '#shared/schemas/links'

/**
 * Public: someone asks the firm for work. No sign-in. Validated like any input, a honeypot
 * field for bots, at most 5 an hour from one address. Creates (or reuses, by e-mail) the
 * customer, adds the site and the enquiry, and e-mails the firm.
 */
export default defineEventHandler(async (event) => {
  const { key } = await readParamsWith(event, formKeyParam)
  const input = await readBodyWith(event, publicEnquirySchema)
  // an unknown or reset link is a 404 before it counts against the sender
  await useDb().transaction(tx => firmByFormKey(tx, key))
  // counted and checked in one atomic step: a burst gets at most what is left
  await limitPublicForm(event)
  setResponseStatus(event, 201)
  // a filled honeypot gets the same thanks, and nothing is written
  if (input.website.trim() !== '') return { ok: true }

  const result = await useDb().transaction(async (tx) => {
    const firm = await firmByFormKey(tx, key)
    const f = new FirmScope(tx, firm.id, null)
    let [customer] = await tx.select({ id: customers.id }).from(customers)
      .where(f.where(customers, eq(sql`lower(${customers.email})`, input.email))).limit(1)
    if (!customer) {
      [customer] = await tx.insert(customers).values(f.values({
        kind: 'homeowner' as const, name: input.name, email: input.email, phone: input.phone,
        billingLine1: input.addressLine1, billingTown: input.town, billingPostcode: input.postcode,
      })).returning({ id: customers.id })
    }
    const [site] = await tx.insert(sites).values(f.values({ customerId: customer!.id, line1: input.addressLine1, town: input.town, postcode: input.postcode })).returning({ id: sites.id })
    const [enquiry] = await tx.insert(enquiries).values(f.values({
      customerId: customer!.id, siteId: site!.id, source: 'web-form' as const, description: input.description, preferredDates: input.preferredDates,
    })).returning({ id: enquiries.id })
    await recordNewEnquiry(f, enquiry!.id)
    await f.audit('enquiry.received', 'enquiry', enquiry!.id, { source: 'web-form' })
    return { firm, enquiryId: enquiry!.id, to: await firmRecipients(f, ['owner']) }
  })

  const link = `${useRuntimeConfig().appUrl.replace(/\/$/, '')}/enquiries/${result.enquiryId}`
  await sendMail({
    to: result.to.join(', '),
    replyTo: input.email,
    subject: `New enquiry from ${input.name} (${input.postcode})`,
    text: [
      `${input.name} sent an enquiry through your Setwell form.`,
      ``,
      `Where: ${[input.addressLine1, input.town, input.postcode].filter(Boolean).join(', ')}`,
      `E-mail: ${input.email}`,
      input.phone ? `Phone: ${input.phone}` : '',
      input.preferredDates ? `Preferred dates: ${input.preferredDates}` : '',
      ``,
      input.description,
      ``,
      `Open it: ${link}`,
    ].filter(l => l !== '').join('\n'),
  }).catch(err => console.error('[mail] enquiry notice not sent:', err.message))
  return { ok: true }
})
