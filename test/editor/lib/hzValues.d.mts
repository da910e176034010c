export declare function hzValuesIn(text: string): number[];
