~VERSION INFORMATION
 VERS.   2.0 : CWLS LOG ASCII STANDARD - VERSION 2.0
 WRAP.   YES : MULTIPLE LINES PER DEPTH STEP
#--------------------------------------------
~WELL INFORMATION
#MNEM.UNIT    DATA              : DESCRIPTION
 STRT.M     2.000            : START DEPTH
 STOP.M     3.750            : STOP DEPTH
 STEP.M     0.250            : STEP
 NULL.      -9999           : NULL VALUE
 WELL.      Harrow Creek spectral log  : SECTION NAME
 LOC .      Invented outcrop, Marrow Basin  : LOCATION
 DATE.      2026-08-14        : LOG DATE: FIELD DAY 3
 TIME.      13:45:12          : START TIME
~CURVE INFORMATION
 DEPT.M                 : DEPTH BELOW SECTION TOP
 GR  .API                 : TOTAL GAMMA RAY
 K   .%                   : POTASSIUM
 TH  .PPM                 : THORIUM
 U   .PPM                 : URANIUM
~A
 2.000
 55.0000 1.1000
 8.5000 2.2000
 2.250
 63.4147 1.2000
 8.2000 2.2500
 2.500
 64.0930 1.3000
 7.9000 2.3000
 2.750
 56.4112 1.4000
 -9999 2.3500
 3.000
 47.4320 1.5000
 7.3000 2.4000
 3.250
 45.4108 1.6000
 7.0000 2.4500
 3.500
 52.2058 1.7000
 6.7000 2.5000
 3.750
 61.5699 1.8000
 6.4000 2.5500
