-- The fleet energy figures sum a company's stored days over a range of dates, home by home. With the
-- home and the summed figures carried in the (company_id, day) index (INCLUDE, which drizzle-kit
-- cannot express), PostgreSQL reads only that range of the index and never the table: the work grows
-- with the days asked for, not with the days kept.
DROP INDEX "energy_days_company_day_idx";--> statement-breakpoint
CREATE INDEX "energy_days_company_day_idx" ON "energy_days" USING btree ("company_id", "day")
	INCLUDE ("tank_id", "cost_pence", "drawn_litres40", "heat_pump_heat_kwh", "heat_pump_electricity_kwh", "immersion_solar_heat_kwh", "unpriced_kwh");
