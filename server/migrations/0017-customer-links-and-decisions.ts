import type { QueryInterface } from 'sequelize';

/**
 * Customers in the loop.
 *
 * - `customer_links`: the private links to a job's public page. Only the SHA-256 of the token is kept; a
 *   link lives until revoked or until 30 days after the job's release (worked out when read). A job may
 *   have several live links (one per e-mail that carried one); revoking ends them all.
 * - `estimate_decisions`: every approval or decline of an estimate (by the link, by phone, in person, by
 *   e-mail), with the amount in cents and the estimate version decided on. The job keeps the latest
 *   approval in its own columns, as before; a link approval is one more method.
 * - `jobs.pickup_shop_id`: where the customer collects the instrument (the shop that took it in), which a
 *   transfer does not change. Existing jobs take the shop of their intake event.
 * - Customers: a purchase-order number and a tax-exempt certificate (schools and fleets), and a choice to
 *   receive no notices by e-mail (approval requests still go out).
 */
const upSql = `
create table customer_links (
  network_id uuid not null references networks (id) on delete cascade,
  id uuid not null default gen_random_uuid(),
  job_id uuid not null,
  token_hash bytea not null check (length(token_hash) = 32),
  created_by_user_id uuid,
  created_at timestamptz not null default now(),
  revoked_at timestamptz,
  revoked_by_user_id uuid,
  last_opened_at timestamptz,
  primary key (network_id, id),
  unique (token_hash, network_id),
  foreign key (network_id, job_id) references jobs (network_id, id) on delete cascade
);
create index customer_links_job_idx on customer_links (network_id, job_id);

create table estimate_decisions (
  network_id uuid not null references networks (id) on delete cascade,
  id uuid not null default gen_random_uuid(),
  job_id uuid not null,
  decision text not null check (decision in ('approved', 'declined')),
  method text not null check (method in ('link', 'phone', 'in_person', 'email')),
  name text not null check (length(btrim(name)) between 1 and 200),
  total_cents integer not null check (total_cents >= 0),
  estimate_version integer not null check (estimate_version >= 0),
  decided_at timestamptz not null,
  recorded_by_user_id uuid,
  link_id uuid,
  created_at timestamptz not null default now(),
  primary key (network_id, id),
  foreign key (network_id, job_id) references jobs (network_id, id) on delete cascade
);
create index estimate_decisions_job_idx on estimate_decisions (network_id, job_id, decided_at);

alter table jobs drop constraint if exists jobs_estimate_approval_method_check;
alter table jobs add constraint jobs_estimate_approval_method_check
  check (estimate_approval_method in ('link', 'in_person', 'phone', 'email'));
alter table jobs add column pickup_shop_id uuid;
update jobs j
   set pickup_shop_id = coalesce(
     (select h.shop_id from history_events h
       where h.network_id = j.network_id and h.job_id = j.id and h.kind = 'intake' and h.shop_id is not null
       order by h.occurred_at limit 1),
     j.shop_id);

alter table customers
  add column po_number text check (po_number is null or length(po_number) <= 100),
  add column tax_exempt_certificate text check (tax_exempt_certificate is null or length(tax_exempt_certificate) <= 100),
  add column notices_opt_out boolean not null default false;
`;

const downSql = `
alter table customers drop column if exists notices_opt_out, drop column if exists tax_exempt_certificate, drop column if exists po_number;
alter table jobs drop column if exists pickup_shop_id;
alter table jobs drop constraint if exists jobs_estimate_approval_method_check;
update jobs set estimate_approval_method = 'email' where estimate_approval_method = 'link';
alter table jobs add constraint jobs_estimate_approval_method_check check (estimate_approval_method in ('in_person', 'phone', 'email'));
drop table if exists estimate_decisions;
drop table if exists customer_links;
`;

export async function up({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(upSql);
}

export async function down({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(downSql);
}
