CREATE TABLE `companion` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`slug` varchar(64) NOT NULL,
	`title` varchar(300) NOT NULL,
	`abstract` text NOT NULL,
	`manuscript_ref` varchar(120) NOT NULL DEFAULT '',
	`state` enum('draft','in_review','revising','accepted','published','withdrawn') NOT NULL DEFAULT 'draft',
	`created_by` varchar(40),
	`created_at` timestamp NOT NULL DEFAULT CURRENT_TIMESTAMP,
	`updated_at` timestamp NOT NULL DEFAULT CURRENT_TIMESTAMP ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `companion_id` PRIMARY KEY(`id`),
	CONSTRAINT `companion_slug_unique` UNIQUE(`slug`)
);
--> statement-breakpoint
CREATE TABLE `membership` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`companion_id` bigint unsigned NOT NULL,
	`user_id` varchar(40) NOT NULL,
	`role` enum('reader','reviewer','author','editor') NOT NULL,
	`created_at` timestamp NOT NULL DEFAULT CURRENT_TIMESTAMP,
	`updated_at` timestamp NOT NULL DEFAULT CURRENT_TIMESTAMP ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `membership_id` PRIMARY KEY(`id`),
	CONSTRAINT `membership_companion_user_unique` UNIQUE(`companion_id`,`user_id`)
);
--> statement-breakpoint
CREATE TABLE `session` (
	`id` varchar(255) NOT NULL,
	`user_id` varchar(40) NOT NULL,
	`expires_at` datetime NOT NULL,
	CONSTRAINT `session_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `sign_in_throttle` (
	`throttle_key` varchar(300) NOT NULL,
	`failures` int NOT NULL DEFAULT 0,
	`window_start` datetime NOT NULL,
	`locked_until` datetime,
	CONSTRAINT `sign_in_throttle_throttle_key` PRIMARY KEY(`throttle_key`)
);
--> statement-breakpoint
CREATE TABLE `user` (
	`id` varchar(40) NOT NULL,
	`email` varchar(254) NOT NULL,
	`password_hash` varchar(255) NOT NULL,
	`display_name` varchar(120) NOT NULL,
	`affiliation` varchar(200) NOT NULL DEFAULT '',
	`orcid` varchar(19),
	`site_role` enum('admin','member') NOT NULL DEFAULT 'member',
	`created_at` timestamp NOT NULL DEFAULT CURRENT_TIMESTAMP,
	`updated_at` timestamp NOT NULL DEFAULT CURRENT_TIMESTAMP ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `user_id` PRIMARY KEY(`id`),
	CONSTRAINT `user_email_unique` UNIQUE(`email`)
);
--> statement-breakpoint
ALTER TABLE `companion` ADD CONSTRAINT `companion_created_by_user_id_fk` FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `membership` ADD CONSTRAINT `membership_companion_id_companion_id_fk` FOREIGN KEY (`companion_id`) REFERENCES `companion`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `membership` ADD CONSTRAINT `membership_user_id_user_id_fk` FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `session` ADD CONSTRAINT `session_user_id_user_id_fk` FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `companion_state_idx` ON `companion` (`state`);--> statement-breakpoint
CREATE INDEX `membership_user_idx` ON `membership` (`user_id`);--> statement-breakpoint
CREATE INDEX `session_user_idx` ON `session` (`user_id`);