#!/usr/bin/Rscript
# Writes the SAS, SPSS and Stata fixtures from clinic_followup.csv with R's haven package
# (Debian r-cran-haven, an independent writer of these formats):
#   clinic_followup_v5.xpt, clinic_followup_v8.xpt, clinic_followup.sas7bdat:
#       text columns as SAS character variables (neither format holds value labels),
#       missing ages as the SAS special missing value .A, visit dates with the DATE9. format;
#   clinic_followup.sav (byte-compressed) and clinic_followup.zsav:
#       site, sex and recov as value-labelled numbers; an unrecorded outcome is the
#       user-defined missing code 9 ("not recorded");
#   clinic_followup_haven.dta: value labels; unrecorded outcome and missing age as the Stata
#       extended missing value .a.
# Every file carries variable labels. Run from this folder: Rscript make_stat_files.R
suppressMessages(library(haven))
d <- read.csv("clinic_followup.csv", encoding = "UTF-8", stringsAsFactors = FALSE,
              na.strings = "", colClasses = c(age = "numeric", comment = "numeric"))
d$visitdt <- as.Date(d$visitdt)
labels <- c(site = "Clinic site", sex = "Sex recorded at intake", recov = "Recovered at follow-up",
            age = "Age in years", visitdt = "Follow-up visit date", city = "Home city",
            comment = "Reviewer comment")
with_labels <- function(x) {
  for (n in names(labels)) attr(x[[n]], "label") <- labels[[n]]
  x
}

# SAS: character variables, special missing .A for missing ages.
sas <- d
sas$age <- ifelse(is.na(d$age), tagged_na("A"), d$age)
sas$visitdt <- structure(d$visitdt, format.sas = "DATE9")
sas <- with_labels(sas)
write_xpt(sas, "clinic_followup_v5.xpt", version = 5, name = "CLINIC")
write_xpt(sas, "clinic_followup_v8.xpt", version = 8, name = "CLINIC")
suppressWarnings(write_sas(sas, "clinic_followup.sas7bdat"))

# SPSS: value labels, user-defined missing code 9.
code <- function(x, levels) match(x, levels)
spss <- d
spss$site <- labelled_spss(code(d$site, c("North clinic", "South clinic")),
                           labels = c("North clinic" = 1, "South clinic" = 2))
spss$sex <- labelled_spss(code(d$sex, c("female", "male")), labels = c(female = 1, male = 2))
spss$recov <- labelled_spss(ifelse(is.na(d$recov), 9, ifelse(d$recov == "yes", 1, 0)),
                            labels = c(no = 0, yes = 1, "not recorded" = 9), na_values = 9)
spss <- with_labels(spss)
write_sav(spss, "clinic_followup.sav", compress = "byte")
write_sav(spss, "clinic_followup.zsav", compress = "zsav")

# Stata: value labels, extended missing .a.
dta <- d
dta$site <- labelled(code(d$site, c("North clinic", "South clinic")),
                     labels = c("North clinic" = 1, "South clinic" = 2))
dta$sex <- labelled(code(d$sex, c("female", "male")), labels = c(female = 1, male = 2))
dta$recov <- labelled(ifelse(is.na(d$recov), tagged_na("a"), ifelse(d$recov == "yes", 1, 0)),
                      labels = c(no = 0, yes = 1))
dta$age <- ifelse(is.na(d$age), tagged_na("a"), d$age)
dta <- with_labels(dta)
write_dta(dta, "clinic_followup_haven.dta", version = 15)
