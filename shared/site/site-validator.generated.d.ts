export declare function validateSite(data: unknown): boolean;
export default validateSite;
