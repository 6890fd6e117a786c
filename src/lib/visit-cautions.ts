/** Shown wherever physical work is booked or reported (see the domain notes on safety). */
export const VISIT_CAUTIONS =
	'A service regeneration reaches very high exhaust temperatures — clear the area of anything combustible. ' +
	'Never run an engine in an enclosed space without exhaust extraction. Exhaust and filter surfaces stay hot long after the engine stops. ' +
	'Chock the wheels, apply the parking brake and select park or neutral before applying throttle on a stationary van. ' +
	"Follow the vehicle maker's procedure, local regulations and licensed practice.";
