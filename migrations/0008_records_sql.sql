-- Customer search reads one lower-cased column (trigram GIN index): name, e-mail, phone and the
-- household's streets, cities and ZIPs. Triggers keep it current whoever writes the rows.
CREATE OR REPLACE FUNCTION customers_search_doc(c_id uuid, c_name text, c_email text, c_phone text) RETURNS text
LANGUAGE sql STABLE AS $$
  SELECT lower(concat_ws(' ', c_name, c_email, c_phone,
    (SELECT string_agg(concat_ws(' ', p.street, p.unit, p.city, p.zip), ' ')
       FROM properties p WHERE p.customer_id = c_id AND p.archived_at IS NULL)))
$$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION customers_search_own() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  NEW.search_text := customers_search_doc(NEW.id, NEW.name, NEW.email, NEW.phone);
  RETURN NEW;
END $$;
--> statement-breakpoint
CREATE TRIGGER customers_search_own BEFORE INSERT OR UPDATE OF name, email, phone ON customers
  FOR EACH ROW EXECUTE FUNCTION customers_search_own();
--> statement-breakpoint
CREATE OR REPLACE FUNCTION customers_search_from_property() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP IN ('UPDATE', 'DELETE') THEN
    UPDATE customers c SET search_text = customers_search_doc(c.id, c.name, c.email, c.phone) WHERE c.id = OLD.customer_id;
  END IF;
  IF TG_OP IN ('INSERT', 'UPDATE') THEN
    UPDATE customers c SET search_text = customers_search_doc(c.id, c.name, c.email, c.phone) WHERE c.id = NEW.customer_id;
  END IF;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER properties_customer_search AFTER INSERT OR UPDATE OR DELETE ON properties
  FOR EACH ROW EXECUTE FUNCTION customers_search_from_property();
--> statement-breakpoint
UPDATE customers c SET search_text = customers_search_doc(c.id, c.name, c.email, c.phone);
--> statement-breakpoint
-- One live household per e-mail address: imports match on it, and merges keep it unique.
CREATE UNIQUE INDEX customers_live_email_key ON customers (lower(email)) WHERE email IS NOT NULL AND archived_at IS NULL;
