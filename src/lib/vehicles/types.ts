// View types the vehicle screens share with the server (`$lib/server/vehicles` fills them):
// client code reads them from here, never from server modules.

export interface VehicleRow {
	id: string;
	registration: string;
	vin: string | null;
	make: string;
	model: string;
	year: number | null;
	customerId: string | null;
	customerName: string | null;
	customerPhone: string | null;
	jobs: number;
	lastJobAt: Date | null;
	lastOdometer: number | null;
}

export interface StepPoint {
	entryId: string;
	jobNumber: number;
	on: Date;
	value: number;
	verdict: string | null;
	min: number | null;
	max: number | null;
}

export interface StepSeries {
	label: string;
	unit: string;
	points: StepPoint[];
}
