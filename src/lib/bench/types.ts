// View types the Bench page and its components share with the server, whose entries module
// fills them: client code reads them from here, never from a server-only module.
import type { FluidVerdict, Verdict } from '$lib/phrase';
import type { AdapterDirection } from '$lib/torque/adapter';

/** log_entry.kind and log_entry.source (the pgEnums in db/schema.ts). */
export type EntryKind =
	| 'measure'
	| 'part'
	| 'note'
	| 'done'
	| 'retraction'
	| 'accept'
	| 'redo'
	| 'inspection'
	| 'sign_off';
export type EntrySource = 'typed' | 'voice' | 'system';

/** A step as written on the job card: what changes only when the job's steps are edited. */
export interface StepDefinition {
	id: string;
	position: number;
	procedureId: string;
	procedureName: string;
	label: string;
	aliases: string[];
	unit: string | null;
	nominal: number | null;
	min: number | null;
	max: number | null;
	caution: string | null;
	/** The fluid spec as the manual writes it, or null. */
	fluid: string | null;
	/** The adapter the step is done with (a crowfoot): length in mm and how it sits, or nulls. */
	adapterLengthMm: number | null;
	adapterDirection: AdapterDirection | null;
}

export interface BenchStep extends StepDefinition {
	done: boolean;
	/** Verdict of the latest live measurement, if any. */
	lastVerdict: Verdict | null;
}

export interface EntryView {
	id: string;
	seq: number;
	jobId: string;
	stepId: string | null;
	stepLabel: string | null;
	authorId: string;
	authorName: string;
	kind: EntryKind;
	rawText: string;
	source: EntrySource;
	value: number | null;
	unit: string | null;
	specValue: number | null;
	specUnit: string | null;
	specMin: number | null;
	specMax: number | null;
	specNominal: number | null;
	verdict: Verdict | null;
	/** The grade as called out, normalised, and its verdict against the step's fluid spec. */
	fluid: string | null;
	fluidVerdict: FluidVerdict | null;
	note: string | null;
	torqueToolId: string | null;
	torqueTool: string | null;
	toolCalibrationOverdue: boolean;
	/** Adapter on the wrench: signed mm along the lever (negative: back; 0: crowfoot at 90°). */
	adapterMm: number | null;
	/** The tool's effective length then, and the wrench setting worked out (spec unit). */
	toolLengthMm: number | null;
	wrenchSetting: number | null;
	wrenchSettingUnit: string | null;
	retracts: string | null;
	retractedBy: { id: string; authorName: string; at: string } | null;
	occurredAt: string;
	recordedAt: string;
	photos: { id: string; fileName: string }[];
}

/** "history <step>" on the Bench: a step's past readings on the job's vehicle, newest first. */
export interface StepHistoryView {
	stepLabel: string;
	unit: string | null;
	registration: string | null;
	/** Readings across the vehicle's jobs (this one included), at most `limit`, newest first. */
	readings: {
		entryId: string;
		jobNumber: number;
		thisJob: boolean;
		occurredAt: string;
		value: number;
		verdict: Verdict | null;
	}[];
	/** All readings of the step on the vehicle (more than shown when over the limit). */
	total: number;
}

/** A torque tool as the Bench offers it, with its calibration state on the shop's date. */
export interface ToolView {
	id: string;
	identifier: string;
	kind: string;
	rangeMin: number;
	rangeMax: number;
	unit: string;
	dueDate: string | null;
	/** 'overdue' also when the tool's last check failed (`checkFailed`). */
	state: 'ok' | 'due_soon' | 'overdue';
	/** The date of the tool's last check when it failed; null otherwise. */
	checkFailed: string | null;
	/** For adapter settings; null when the owner has not given it. */
	effectiveLengthMm: number | null;
}
