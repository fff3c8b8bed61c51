import type { z } from 'zod';
import type { propertyInputSchema } from '../../shared/schemas/customers';
import type { Tx } from '../db/client';
import { customers, properties } from '../db/schema';

// Households and properties a bulk import adds. The import checks and matches the rows, inside
// its own transaction; this feature writes them.

export async function insertImportedCustomer(tx: Tx, values: { name: string; email: string | null; phone: string | null }): Promise<string> {
  const [c] = await tx.insert(customers).values(values).returning({ id: customers.id });
  return c!.id;
}

export async function insertImportedProperty(tx: Tx, customerId: string, values: z.infer<typeof propertyInputSchema>): Promise<string> {
  const [p] = await tx
    .insert(properties)
    .values({ ...values, customerId })
    .returning({ id: properties.id });
  return p!.id;
}
