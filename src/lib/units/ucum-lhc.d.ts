// @lhncbc/ucum-lhc ships no type declarations; this covers the part the tests use as an oracle.
declare module '@lhncbc/ucum-lhc' {
	interface ConvertResult {
		status: 'succeeded' | 'failed' | 'error';
		toVal: number | null;
		msg: string[];
	}
	interface ValidateResult {
		status: 'valid' | 'invalid' | 'error';
		msg: string[];
	}
	interface UcumLhcUtils {
		convertUnitTo(fromUnitCode: string, fromVal: number, toUnitCode: string): ConvertResult;
		validateUnitString(uStr: string): ValidateResult;
	}
	const ucum: { UcumLhcUtils: { getInstance(): UcumLhcUtils } };
	export default ucum;
}
