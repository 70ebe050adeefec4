// Suppliers of purchased inputs: list, create, edit or archive, and the organisation-scoped lookup.
import type { Transaction } from 'sequelize';
import type { SessionUser, Supplier as SupplierDto, SupplierCreateInput, SupplierUpdateInput } from '@shared/schemas';
import type { AppContext } from '../context';
import { notFound } from '../errors';
import type { Supplier } from '../models';

const toSupplierDto = (s: Supplier): SupplierDto => ({
  id: s.id, name: s.name, contactName: s.contactName, email: s.email, phone: s.phone, leadTimeDays: s.leadTimeDays, notes: s.notes,
  archivedAt: s.archivedAt ? s.archivedAt.toISOString() : null,
});

export async function listSuppliers(ctx: AppContext, actor: SessionUser): Promise<SupplierDto[]> {
  const rows = await ctx.db.models.Supplier.findAll({ where: { organisationId: actor.organisationId }, order: [['name', 'ASC']] });
  return rows.map(toSupplierDto);
}

export async function supplierFor(ctx: AppContext, actor: SessionUser, id: number, transaction?: Transaction) {
  const s = await ctx.db.models.Supplier.findOne({ where: { id, organisationId: actor.organisationId }, transaction });
  if (!s) throw notFound('Supplier');
  return s;
}

export async function createSupplier(ctx: AppContext, actor: SessionUser, input: SupplierCreateInput): Promise<SupplierDto> {
  return toSupplierDto(await ctx.db.models.Supplier.create({ ...input, organisationId: actor.organisationId, archivedAt: null }));
}

export async function updateSupplier(ctx: AppContext, actor: SessionUser, id: number, input: SupplierUpdateInput): Promise<SupplierDto> {
  const s = await supplierFor(ctx, actor, id);
  const { archived, ...fields } = input;
  await s.update({ ...fields, ...(archived === undefined ? {} : { archivedAt: archived ? (s.archivedAt ?? new Date()) : null }) });
  return toSupplierDto(s);
}
