// Names of the demo objects the seed creates, in a module with no server imports: tests look the
// objects up by them.
export const demoDatasetName = "Larkspur weekly history 2023–2025";
export const demoApprovedFitName = "Weekly sales on six channels and promotions";
export const demoDraftFitName = "Weekly sales without online video";
export const demoSpringScenarioName = "Spring quarter: more search, less display";
export const demoGrowthScenarioName = "Spring quarter: up to 10% more budget";
export const demoComparisonName = "Spring quarter options";
